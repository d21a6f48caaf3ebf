// Command genplates writes a synthetic repository of clean plates for
// benchmarks:
//
//	go run ./rules/lint/internal/gen/cmd/genplates -n 2000 -o /tmp/plates
package main

import (
	"flag"
	"fmt"
	"os"

	"github.com/datumlint/datumlint/rules/lint/internal/gen"
)

func main() {
	n := flag.Int("n", 2000, "number of plates")
	out := flag.String("o", "", "folder to write into (created if missing)")
	flag.Parse()
	if *out == "" || *n < 0 || flag.NArg() > 0 {
		fmt.Fprintln(os.Stderr, "usage: genplates -n COUNT -o FOLDER")
		os.Exit(2)
	}
	st, err := gen.Write(*out, *n)
	if err != nil {
		fmt.Fprintln(os.Stderr, "genplates:", err)
		os.Exit(1)
	}
	fmt.Printf("%d files, %d lines, %d bytes in %s\n", st.Files, st.Lines, st.Bytes, *out)
}
