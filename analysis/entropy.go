package analysis

import (
	"crypto/sha256"
	"encoding/hex"
	"fmt"
	"io"

	"unfold/symbolic"
)

// EntropyOptions are the options of the entropy stage (the flags of `unfold entropy` for a
// symbol stream).
type EntropyOptions struct {
	// MaxLength is the longest word length (0: symbolic.DefaultMaxLength).
	MaxLength int
	// Estimator is the block-entropy estimator: "grassberger", "miller-madow" or "plugin".
	Estimator string
	// LZMax is the number of symbols kept for the Lempel–Ziv complexity.
	LZMax int
}

// DefaultEntropyOptions returns the defaults of `unfold entropy`.
func DefaultEntropyOptions() EntropyOptions {
	return EntropyOptions{Estimator: "grassberger", LZMax: 20_000_000}
}

// EntropyParams are the "parameters" of the entropy stage.
type EntropyParams struct {
	Estimator     string `json:"estimator"`
	MaxLength     int    `json:"max_length"`
	RateLength    int    `json:"rate_length"`
	Alphabet      string `json:"alphabet"`
	Extrapolation string `json:"extrapolation"`
	LZMax         int    `json:"lz_max"`
}

// LZ76JSON is the Lempel–Ziv (1976) complexity: phrases and normalised value.
type LZ76JSON struct {
	Phrases    int     `json:"phrases"`
	Normalized float64 `json:"normalized"`
}

// EntropyResult is the JSON body of the entropy stage.
type EntropyResult struct {
	EntropyRate    float64                `json:"entropy_rate"`
	ExcessEntropy  float64                `json:"excess_entropy"`
	BlockEntropies []symbolic.Block       `json:"block_entropies"`
	EntropyRates   []symbolic.Rate        `json:"entropy_rates"`
	LZ76           float64                `json:"lz76"`
	LZ76Detail     LZ76JSON               `json:"lz76_phrases"`
	Partition      symbolic.PartitionInfo `json:"partition"`
	Source         symbolic.Source        `json:"source"`
	Cautions       []string               `json:"cautions"`
}

// Entropy reads the symbol stream r (named path, checked against its sidecar sc) and
// returns the JSON input, parameters and body of `entropy`; the command and the report both
// use it. The input's SHA-256 is that of the stream's bytes as read.
func (e *Env) Entropy(path string, r io.Reader, sc *symbolic.Sidecar, o EntropyOptions) (*Input, EntropyParams, EntropyResult, error) {
	est, err := symbolic.ParseEstimator(o.Estimator)
	if err != nil {
		return nil, EntropyParams{}, EntropyResult{}, Usagef("entropy: --estimator: %v", err)
	}
	h := sha256.New()
	sr, err := symbolic.NewReader(io.TeeReader(r, h), sc, path)
	if err != nil {
		return nil, EntropyParams{}, EntropyResult{}, err
	}
	k := sc.AlphabetSize
	maxL := o.MaxLength
	if maxL == 0 {
		maxL = symbolic.DefaultMaxLength(sc.Count, k)
	}
	if lim := symbolic.MaxWordLength(k); maxL > lim {
		return nil, EntropyParams{}, EntropyResult{}, Usagef("entropy: --max-length %d is too long for %d symbols (at most %d)", maxL, k, lim)
	}
	if k < 2 {
		return nil, EntropyParams{}, EntropyResult{}, NoAnswer(fmt.Errorf("entropy: %s: the alphabet has one symbol: every entropy is 0", path))
	}
	bc, err := symbolic.NewBlockCounter(k, maxL)
	if err != nil {
		return nil, EntropyParams{}, EntropyResult{}, Usagef("entropy: %v", err)
	}
	// block counts stream over the whole stream; LZ76 needs its symbols in memory, so it
	// keeps at most --lz-max of them
	if o.LZMax < 2 {
		return nil, EntropyParams{}, EntropyResult{}, Usagef("entropy: --lz-max must be ≥ 2")
	}
	all := make([]uint8, 0, min(sc.Count, int64(o.LZMax)))
	var total int64
	buf := make([]uint8, 1<<15)
	for {
		n, err := sr.Read(buf)
		if n > 0 {
			if err := bc.Add(buf[:n]); err != nil {
				return nil, EntropyParams{}, EntropyResult{}, err
			}
			total += int64(n)
			if room := o.LZMax - len(all); room > 0 {
				all = append(all, buf[:min(n, room)]...)
			}
		}
		if err == io.EOF {
			break
		}
		if err != nil {
			return nil, EntropyParams{}, EntropyResult{}, err
		}
	}
	if len(all) < 2 {
		return nil, EntropyParams{}, EntropyResult{}, NoAnswer(fmt.Errorf("entropy: %s: %d symbols are too few", path, len(all)))
	}
	res, err := symbolic.Analyze(bc, est)
	if err != nil {
		return nil, EntropyParams{}, EntropyResult{}, NoAnswer(fmt.Errorf("entropy: %s: %w", path, err))
	}
	lz, err := symbolic.Complexity(all, k)
	if err != nil {
		return nil, EntropyParams{}, EntropyResult{}, NoAnswer(fmt.Errorf("entropy: %s: %w", path, err))
	}
	cautions := res.Cautions
	if int64(len(all)) < total {
		cautions = append(cautions, fmt.Sprintf("the Lempel–Ziv complexity is of the first %d of %d symbols (--lz-max)", len(all), total))
	}
	if cautions == nil {
		cautions = []string{}
	}
	in := &Input{Path: path, SHA256: hex.EncodeToString(h.Sum(nil)), Samples: int(total), Dt: 1}
	return in,
		EntropyParams{Estimator: res.Estimator, MaxLength: maxL, RateLength: res.RateLength, Alphabet: sc.Alphabet, Extrapolation: res.Extrapolation, LZMax: o.LZMax},
		EntropyResult{EntropyRate: res.EntropyRate, ExcessEntropy: res.ExcessEntropy, BlockEntropies: res.Blocks,
			EntropyRates: res.Rates, LZ76: lz.Normalized, LZ76Detail: LZ76JSON{Phrases: lz.Phrases, Normalized: lz.Normalized},
			Partition: sc.Partition, Source: sc.Source, Cautions: cautions}, nil
}
