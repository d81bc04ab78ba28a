package unit_test

import (
	"encoding/json"
	"fmt"

	"github.com/ampwright/ampwright/schema/unit"
)

func ExampleParseAs() {
	q, err := unit.ParseAs("15 ft", unit.DimLength)
	fmt.Println(q.Value, q, q.Imperial(), err)

	_, err = unit.ParseAs("12 V", unit.DimLength)
	fmt.Println(err)
	// Output:
	// 4.572 15 ft true <nil>
	// "12 V" is a voltage; a length is expected, such as "4.5 m" or "15 ft"
}

func ExampleSize() {
	var cable struct {
		Conductor unit.Size
		Run       unit.Length
	}
	err := json.Unmarshal([]byte(`{"Conductor": "2/0 AWG", "Run": "4.5 m"}`), &cable)
	if err != nil {
		fmt.Println(err)
		return
	}
	gauge, _ := cable.Conductor.AWG()
	fmt.Printf("%s (gauge %d): %.1f mm², %g m\n", cable.Conductor, gauge, cable.Conductor.MM2(), cable.Run.Metres())
	// Output:
	// 2/0 AWG (gauge -1): 67.4 mm², 4.5 m
}
