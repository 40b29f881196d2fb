package parse_test

import (
	"encoding/json"
	"fmt"

	"github.com/backshift/backshift/parse"
)

func ExampleSpec() {
	var cfg struct {
		Model parse.Spec `json:"model"`
	}
	err := json.Unmarshal([]byte(`{"model": "flow = w0 B^2 rain + 1 / (1 - phi1 B) a"}`), &cfg)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(cfg.Model.Model.Inputs[0].Series, cfg.Model.Model.Inputs[0].Delay)
	out, _ := json.Marshal(cfg)
	fmt.Println(string(out))
	// Output:
	// rain 2
	// {"model":"flow = w0 B^2 rain + AR(1)"}
}
