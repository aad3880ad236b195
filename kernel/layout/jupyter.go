package layout

import (
	"os"
	"os/exec"
)

// Jupyter returns the jupyter command to use: $BEAMNOTE_JUPYTER if set, else
// Debian's /usr/bin/jupyter (whose Python sees the Debian packages), else the
// first jupyter on PATH. It returns "" when there is none.
func Jupyter() string {
	return findTool("BEAMNOTE_JUPYTER", "/usr/bin/jupyter", "jupyter")
}

// Python returns the Python interpreter that sees Jupyter's packages:
// $BEAMNOTE_PYTHON, else /usr/bin/python3, else python3 on PATH.
func Python() string {
	return findTool("BEAMNOTE_PYTHON", "/usr/bin/python3", "python3")
}

func findTool(envName, fixed, onPath string) string {
	if p := os.Getenv(envName); p != "" {
		return p
	}
	if _, err := os.Stat(fixed); err == nil {
		return fixed
	}
	if p, err := exec.LookPath(onPath); err == nil {
		return p
	}
	return ""
}

// JupyterEnv is the environment for jupyter commands run by beamnote:
// the project-local data directory (kernelspecs, notebook signatures,
// runtime files) unless the kernelspec was installed for the user.
func (l Layout) JupyterEnv(user bool) map[string]string {
	if user {
		return map[string]string{}
	}
	return map[string]string{
		"JUPYTER_DATA_DIR": l.JupyterData(),
		"JUPYTER_PATH":     l.JupyterData(),
	}
}
