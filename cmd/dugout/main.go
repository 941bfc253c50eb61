// Command dugout estimates garden ponds, water features and small
// excavations from a contractor's survey: earthwork cut and fill with haul,
// liner sheet, shoreline, edge stone and gravel, crew time, water volume and
// pump duty, with drawings and a printable report.
package main

import (
	"context"
	"os"
	"os/signal"
)

func main() {
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt)
	code := Main(ctx, SystemIO(), os.Args[1:])
	stop()
	os.Exit(int(code))
}
