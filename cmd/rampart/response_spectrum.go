package main

import (
	"bytes"
	"fmt"
	"math"
	"os"
	"strconv"
	"strings"

	"rampart/mc"
	"rampart/noise"
)

// spectrumHelp describes --spectrum for the flag and its errors.
const spectrumHelp = "PROCESS=TERM[+TERM...] with PROCESS rin, phase, field or rotation and each TERM white:S (S unit^2/Hz), powerlaw:H:ALPHA (H f^ALPHA unit^2/Hz, the IEEE Std 1139 form) or table:FILE (an intensity-noise table in dB/Hz for rin, an L(f) table in dBc/Hz for phase); units 1/Hz, rad^2/Hz (each arm's drive phase), uG^2/Hz, (urad/s)^2/Hz (the platform's rotation rate), the budget's units"

// applySpectra replaces the PSD of each process named in specs (the
// --spectrum values) in budget b, switching it on if it was off.
func applySpectra(b mc.Budget, specs []string) (mc.Budget, error) {
	for _, spec := range specs {
		name, psd, err := parseSpectrum(spec)
		if err != nil {
			return b, fmt.Errorf("--spectrum %q: %w", spec, err)
		}
		switch name {
		case mc.ProcessRIN:
			b.RIN, b.RINBand = psd, noise.Band{}
		case mc.ProcessPhase:
			b.Phase = psd
		case mc.ProcessField:
			b.FieldNoise = psd
		case mc.ProcessRotation:
			b.RotationNoise = psd
		}
	}
	return b, nil
}

// parseSpectrum parses one --spectrum value into the process's name and
// its PSD (a sum when it has several terms).
func parseSpectrum(spec string) (string, noise.PSD, error) {
	name, rest, ok := strings.Cut(spec, "=")
	name = strings.TrimSpace(name)
	if !ok || rest == "" {
		return "", nil, fmt.Errorf("want %s", spectrumHelp)
	}
	if name != mc.ProcessRIN && name != mc.ProcessPhase && name != mc.ProcessField && name != mc.ProcessRotation {
		return "", nil, fmt.Errorf("unknown process %q: want rin, phase, field or rotation", name)
	}
	var sum noise.Sum
	for _, term := range strings.Split(rest, "+") {
		p, err := parseTerm(name, strings.TrimSpace(term))
		if err != nil {
			return "", nil, err
		}
		sum = append(sum, p)
	}
	if len(sum) == 1 {
		return name, sum[0], nil
	}
	return name, sum, nil
}

// parseTerm parses one term of a spectrum of process name.
func parseTerm(name, term string) (noise.PSD, error) {
	kind, args, _ := strings.Cut(term, ":")
	number := func(s, what string) (float64, error) {
		x, err := strconv.ParseFloat(strings.TrimSpace(s), 64)
		if err != nil || math.IsNaN(x) || math.IsInf(x, 0) {
			return 0, fmt.Errorf("term %q: %s %q is not a finite number", term, what, s)
		}
		return x, nil
	}
	// A field and a rotation rate are given in the budget's lab units,
	// uG and urad/s (mc.Sources), their PSDs in those units^2/Hz.
	si := 1.0
	if name == mc.ProcessField || name == mc.ProcessRotation {
		si = 1e-12
	}
	switch kind {
	case "white":
		s, err := number(args, "level")
		if err != nil {
			return nil, err
		}
		if !(s > 0) {
			return nil, fmt.Errorf("term %q: a white level must be positive (unit^2/Hz)", term)
		}
		return noise.White{Level: s * si}, nil
	case "powerlaw":
		hs, as, ok := strings.Cut(args, ":")
		if !ok {
			return nil, fmt.Errorf("term %q: want powerlaw:H:ALPHA", term)
		}
		h, err := number(hs, "coefficient H")
		if err != nil {
			return nil, err
		}
		a, err := number(as, "exponent ALPHA")
		if err != nil {
			return nil, err
		}
		if !(h > 0) {
			return nil, fmt.Errorf("term %q: the coefficient H must be positive (unit^2/Hz at 1 Hz)", term)
		}
		return noise.PowerLaw{H: h * si, Alpha: a}, nil
	case "table":
		if args == "" {
			return nil, fmt.Errorf("term %q: want table:FILE", term)
		}
		data, err := os.ReadFile(args)
		if err != nil {
			return nil, fmt.Errorf("term %q: %w", term, err)
		}
		switch name {
		case mc.ProcessRIN:
			return noise.ParseRIN(bytes.NewReader(data), args)
		case mc.ProcessPhase:
			return noise.ParsePhaseNoise(bytes.NewReader(data), args)
		}
		return nil, fmt.Errorf("term %q: %s noise has no table format; give white or powerlaw terms", term, name)
	}
	return nil, fmt.Errorf("term %q: want white:S, powerlaw:H:ALPHA or table:FILE", term)
}
