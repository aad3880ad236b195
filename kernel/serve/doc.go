// Package serve starts the Jupyter notebook server on the checkout's
// notebooks with the beamnote kernel as the default: the second step of the
// notebook flow (install → serve → run and check → record). It serves the
// kernel that package install registered.
//
// # Notebook server
//
// [Command] refuses a non-loopback address unless asked, and passes the
// server's token in the environment (JUPYTER_TOKEN), never on the command
// line, which every local user can read in the process list;
// [SignNotebooks] marks the committed notebooks as trusted so that their
// stored figures show; [Run] ("beamnote-kernel serve") runs the server and
// prints the URL once the server answers it ([WaitServing]).
//
// # Errors
//
// Functions return errors that name the step and the command that failed;
// nothing here panics on the state of the machine.
package serve
