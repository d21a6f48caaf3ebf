// Command genqif grows a QIF model to a size, for timing checks of large
// QIF files:
//
//	go run ./rules/lint/internal/gen/cmd/genqif -shape features -mb 4 \
//	    -o /tmp/features-4mb.qif testdata/qif/nist/nist_ftc_06_asme1_ap242.qif
//
// Shapes: features (the model's features and characteristics repeated, no
// B-rep) and brep (the model's geometry repeated, which the reader skips).
package main

import (
	"flag"
	"fmt"
	"os"

	"github.com/datumlint/datumlint/rules/lint/internal/gen"
)

func main() {
	shape := flag.String("shape", "features", "features or brep")
	mb := flag.Int("mb", 4, "size in MiB")
	out := flag.String("o", "", "file to write")
	flag.Parse()
	grow := map[string]func(string, int) string{"features": gen.QIFFeatures, "brep": gen.QIFBrep}[*shape]
	if *out == "" || flag.NArg() != 1 || grow == nil || *mb < 1 {
		fmt.Fprintln(os.Stderr, "usage: genqif -shape features|brep -mb SIZE -o OUT.qif MODEL.qif")
		os.Exit(2)
	}
	src, err := os.ReadFile(flag.Arg(0))
	if err != nil {
		fmt.Fprintln(os.Stderr, "genqif:", err)
		os.Exit(1)
	}
	doc := grow(string(src), *mb<<20)
	if err := os.WriteFile(*out, []byte(doc), 0o644); err != nil {
		fmt.Fprintln(os.Stderr, "genqif:", err)
		os.Exit(1)
	}
	fmt.Printf("%d bytes in %s\n", len(doc), *out)
}
