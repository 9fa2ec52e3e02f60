package units_test

import (
	"fmt"

	"bivar/analysis/units"
)

func ExampleAffine() {
	scale, offset, _ := units.Affine("Cel", "[degF]")
	fmt.Printf("°F = %g·°C + %g\n", scale, offset)
	scale, _, _ = units.Affine("[psi]", "kPa")
	fmt.Printf("1 psi = %.6f kPa\n", scale)
	_, _, err := units.Affine("mm", "kg")
	fmt.Println(err)
	// Output:
	// °F = 1.8·°C + 32
	// 1 psi = 6.894757 kPa
	// cannot convert "mm" (length) to "kg" (mass): they measure different quantities
}
