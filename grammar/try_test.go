package grammar

import (
	"fmt"
	"os"
	"testing"
)

func TestTry(t *testing.T) {
	src, _ := os.ReadFile(os.Getenv("F"))
	f := Parse("x", src)
	for i, s := range f.Stmts {
		fmt.Printf("%v %T %v\n", f.Extents[i], s, s.Span())
	}
	for _, e := range f.Errors {
		fmt.Println("ERR", e)
	}
}
