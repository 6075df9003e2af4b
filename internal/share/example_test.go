package share_test

import (
	"fmt"

	"github.com/sill-tool/sill/internal/share"
)

func ExampleParse() {
	for _, text := range []string{"0.05", "5%", " 7.5 % ", "5%%", "-5%", "105%"} {
		v, err := share.Parse(text)
		if err != nil {
			fmt.Println(err)
			continue
		}
		fmt.Println(v)
	}
	// Output:
	// 0.05
	// 0.05
	// 0.075
	// "5%%" has more than one percent sign, expected a share from 0 to 1 or a percentage from 0% to 100%, such as 0.05 or 5%
	// "-5%" is negative, expected a share from 0 to 1 or a percentage from 0% to 100%, such as 0.05 or 5%
	// "105%" is more than 100%, expected a share from 0 to 1 or a percentage from 0% to 100%, such as 0.05 or 5%
}
