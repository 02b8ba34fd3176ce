package embed

import "fmt"

func ksgMI(x []float64, maxLag int, opt MIOptions) (*MICurve, error) {
	return nil, fmt.Errorf("mutual information: KSG not yet available")
}
