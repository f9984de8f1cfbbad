package formats_test

import (
	"fmt"
	"math"
	"os"
	"strings"

	"lamina/formats"
)

func ExampleTable() {
	t := formats.NewTable(os.Stdout)
	t.Comment("q1\tq2\tq3\tf1 (THz)")
	t.Row([]string{"G"}, []float64{0, 0, 0, 0})
	t.Row(nil, []float64{0.5, 0, 0, 15.6333042})
	if err := t.Row(nil, []float64{0.5, 0.5, 0, math.NaN()}); err != nil {
		fmt.Println(err)
	}
	if err := t.Flush(); err != nil {
		fmt.Println(err)
	}
	// Output:
	// formats: table row 2, column 3: value NaN is not finite
	// # q1	q2	q3	f1 (THz)
	// G	0	0	0	0
	// 0.5	0	0	15.6333042
}

func ExampleReadQPoints() {
	in := "# a path through the zone\n0 0 0\n1/3 1/3 0  # corner\n0.5 0 0\n"
	qs, err := formats.ReadQPoints(strings.NewReader(in), "path.txt")
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, q := range qs {
		fmt.Printf("%.4f\n", q)
	}
	_, err = formats.ReadQPoints(strings.NewReader("0 0 0\n0 1/0 0\n"), "bad.txt")
	fmt.Println(err)
	// Output:
	// [0.0000 0.0000 0.0000]
	// [0.3333 0.3333 0.0000]
	// [0.5000 0.0000 0.0000]
	// bad.txt:2: coordinate 2: "1/0" divides by zero
}
