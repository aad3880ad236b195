package nb

import (
	"context"
	"os"
	"os/signal"
	"sync"
)

var cell struct {
	once sync.Once
	ctx  context.Context
}

// Context returns the context of the cell program: it is cancelled when
// the notebook interrupts the cell (Jupyter's interrupt; gonb v0.11.4
// sends the cell program SIGINT and kills it 5 s later). Pass it to long
// computations, which then stop early and return what they finished with
// the context's error:
//
//	res := nb.Must(study.MonteCarlo(nb.Context(), tolerance.Options{Trials: 100_000, Seed: 1}))
//
// Once Context has been called, the first SIGINT cancels the context
// instead of ending the program (signal.NotifyContext), so the cell can end
// in order: nb.Must reports "context canceled" and the cell stops. A second
// SIGINT ends the program at once, as without Context.
func Context() context.Context {
	cell.once.Do(func() {
		ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt)
		cell.ctx = ctx
		go func() {
			<-ctx.Done()
			stop() // the default action again for a second interrupt
		}()
	})
	return cell.ctx
}
