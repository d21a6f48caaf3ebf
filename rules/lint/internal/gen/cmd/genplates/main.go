// Command genplates writes a synthetic repository of clean parts for
// benchmarks:
//
//	go run ./rules/lint/internal/gen/cmd/genplates -n 2000 -o /tmp/plates
//	go run ./rules/lint/internal/gen/cmd/genplates -shape mix -features 1000 -n 1 -o /tmp/mix1000
//
// -shape chooses the kind of part (plate, composite, mix, turned, inch,
// flange; see package gen) and -features the number of located features in
// each (0: the shape's own size, 12 to 28).
package main

import (
	"flag"
	"fmt"
	"os"

	"github.com/datumlint/datumlint/rules/lint/internal/gen"
)

func main() {
	n := flag.Int("n", 2000, "number of parts")
	out := flag.String("o", "", "folder to write into (created if missing)")
	shape := flag.String("shape", "plate", "kind of part: plate, composite, mix, turned, inch or flange")
	features := flag.Int("features", 0, "located features per part (0: the shape's own size)")
	flag.Parse()
	if *out == "" || *n < 0 || *features < 0 || flag.NArg() > 0 {
		fmt.Fprintln(os.Stderr, "usage: genplates [-shape SHAPE] [-features N] -n COUNT -o FOLDER")
		os.Exit(2)
	}
	s, err := gen.ParseShape(*shape)
	if err != nil {
		fmt.Fprintln(os.Stderr, "genplates:", err)
		os.Exit(2)
	}
	st, err := gen.WriteShape(*out, *n, s, *features)
	if err != nil {
		fmt.Fprintln(os.Stderr, "genplates:", err)
		os.Exit(1)
	}
	fmt.Printf("%d files, %d lines, %d bytes in %s\n", st.Files, st.Lines, st.Bytes, *out)
}
