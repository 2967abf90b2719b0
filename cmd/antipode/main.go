// Command antipode checks complementary colours and calibrates mixing
// models from measured spectra. Run "antipode help" for the commands.
package main

import (
	"os"
)

func main() {
	os.Exit(run(os.Args[1:], os.Stdin, os.Stdout, os.Stderr))
}
