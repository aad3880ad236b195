// Package atomicfile writes files so that a reader never sees a partial one.
package atomicfile

import (
	"fmt"
	"os"
	"path/filepath"
)

// Write writes data to a temporary file in the directory of path, syncs it,
// sets perm and renames it over path. On any error the temporary file is
// removed and path is left as it was.
func Write(path string, data []byte, perm os.FileMode) error {
	f, err := os.CreateTemp(filepath.Dir(path), "."+filepath.Base(path)+".*")
	if err != nil {
		return fmt.Errorf("writing %s: %w", path, err)
	}
	tmp := f.Name()
	_, werr := f.Write(data)
	serr := f.Sync()
	cerr := f.Close()
	for _, e := range []error{werr, serr, cerr, os.Chmod(tmp, perm)} {
		if e != nil {
			os.Remove(tmp)
			return fmt.Errorf("writing %s: %w", path, e)
		}
	}
	if err := os.Rename(tmp, path); err != nil {
		os.Remove(tmp)
		return fmt.Errorf("writing %s: %w", path, err)
	}
	return nil
}
