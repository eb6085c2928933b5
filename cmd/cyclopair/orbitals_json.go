package main

import (
	"math"
	"strconv"
	"unicode/utf8"
)

// An appending JSON encoder for orbitals records: the bytes encoding/json writes for
// orbitalsJSON (same key order, omitempty rules, null for nil pointers and slices, HTML-safe
// string escaping, numbers through num), written with strconv.Append* and no reflection, so
// a batch of thousands of molecules spends its time on the chemistry. TestOrbitalsJSONEncoder
// checks it against encoding/json.

func appendNum(b []byte, v num) []byte {
	f := float64(v)
	if math.IsNaN(f) || math.IsInf(f, 0) {
		return append(b, "null"...)
	}
	return appendRound6(b, f)
}

const hexDigits = "0123456789abcdef"

// appendString writes s as encoding/json does with HTML escaping on (json.Marshal).
func appendString(b []byte, s string) []byte {
	b = append(b, '"')
	start := 0
	for i := 0; i < len(s); {
		c := s[i]
		if c < utf8.RuneSelf {
			if c >= 0x20 && c != '"' && c != '\\' && c != '<' && c != '>' && c != '&' {
				i++
				continue
			}
			b = append(b, s[start:i]...)
			switch c {
			case '"', '\\':
				b = append(b, '\\', c)
			case '\n':
				b = append(b, '\\', 'n')
			case '\r':
				b = append(b, '\\', 'r')
			case '\t':
				b = append(b, '\\', 't')
			default:
				b = append(b, '\\', 'u', '0', '0', hexDigits[c>>4], hexDigits[c&0xF])
			}
			i++
			start = i
			continue
		}
		r, size := utf8.DecodeRuneInString(s[i:])
		if r == utf8.RuneError && size == 1 {
			b = append(b, s[start:i]...)
			b = append(b, `\ufffd`...)
			i += size
			start = i
			continue
		}
		if r == '\u2028' || r == '\u2029' {
			b = append(b, s[start:i]...)
			b = append(b, '\\', 'u', '2', '0', '2', hexDigits[r&0xF])
			i += size
			start = i
			continue
		}
		i += size
	}
	b = append(b, s[start:]...)
	return append(b, '"')
}

func appendBool(b []byte, v bool) []byte { return strconv.AppendBool(b, v) }

func appendInts(b []byte, v []int) []byte {
	if v == nil {
		return append(b, "null"...)
	}
	b = append(b, '[')
	for i, x := range v {
		if i > 0 {
			b = append(b, ',')
		}
		b = strconv.AppendInt(b, int64(x), 10)
	}
	return append(b, ']')
}

func appendFrontier(b []byte, f *frontierJSON) []byte {
	if f == nil {
		return append(b, "null"...)
	}
	b = append(b, `{"index":`...)
	b = strconv.AppendInt(b, int64(f.Index), 10)
	b = append(b, `,"x":`...)
	b = appendNum(b, f.X)
	b = append(b, `,"ev":`...)
	b = appendNum(b, f.EV)
	b = append(b, `,"degenerate":`...)
	b = appendBool(b, f.Degenerate)
	b = append(b, `,"degeneracy":`...)
	b = strconv.AppendInt(b, int64(f.Degeneracy), 10)
	b = append(b, `,"set":`...)
	b = appendInts(b, f.Set)
	return append(b, '}')
}

// appendOrbitalsJSON appends the JSON object of j (no newline).
func appendOrbitalsJSON(b []byte, j *orbitalsJSON) []byte {
	b = append(b, `{"smiles":`...)
	b = appendString(b, j.SMILES)
	if j.Name != "" {
		b = append(b, `,"name":`...)
		b = appendString(b, j.Name)
	}
	b = append(b, `,"params":`...)
	b = appendString(b, j.Params)
	b = append(b, `,"method":`...)
	b = appendString(b, j.Method)
	b = append(b, `,"electrons":`...)
	b = strconv.AppendInt(b, int64(j.Electrons), 10)
	b = append(b, `,"pi_energy":`...)
	b = appendNum(b, j.PiEnergy)
	b = append(b, `,"homo":`...)
	b = appendFrontier(b, j.HOMO)
	b = append(b, `,"lumo":`...)
	b = appendFrontier(b, j.LUMO)
	if j.SOMO != nil {
		b = append(b, `,"somo":`...)
		b = appendFrontier(b, j.SOMO)
	}
	b = append(b, `,"gap":`...)
	if j.Gap == nil {
		b = append(b, "null"...)
	} else {
		b = append(b, `{"beta":`...)
		b = appendNum(b, j.Gap.Beta)
		b = append(b, `,"ev":`...)
		b = appendNum(b, j.Gap.EV)
		b = append(b, '}')
	}
	b = append(b, `,"open_shell":`...)
	b = appendBool(b, j.OpenShell)
	b = append(b, `,"omega":`...)
	b = appendNum(b, j.Omega)
	if j.Iterations != 0 {
		b = append(b, `,"omega_iterations":`...)
		b = strconv.AppendInt(b, int64(j.Iterations), 10)
	}
	if j.SCFCycles != 0 {
		b = append(b, `,"scf_cycles":`...)
		b = strconv.AppendInt(b, int64(j.SCFCycles), 10)
	}
	b = append(b, `,"levels":`...)
	if j.Levels == nil {
		b = append(b, "null"...)
	} else {
		b = append(b, '[')
		for i := range j.Levels {
			l := &j.Levels[i]
			if i > 0 {
				b = append(b, ',')
			}
			b = append(b, `{"x":`...)
			b = appendNum(b, l.X)
			b = append(b, `,"ev":`...)
			b = appendNum(b, l.EV)
			b = append(b, `,"occupancy":`...)
			b = appendNum(b, l.Occupancy)
			b = append(b, `,"degeneracy":`...)
			b = strconv.AppendInt(b, int64(l.Degeneracy), 10)
			b = append(b, `,"fragment":`...)
			b = strconv.AppendInt(b, int64(l.Fragment), 10)
			b = append(b, `,"coefficients":`...)
			if l.Coefficients == nil {
				b = append(b, "null"...)
			} else {
				b = append(b, '[')
				for k, c := range l.Coefficients {
					if k > 0 {
						b = append(b, ',')
					}
					b = appendNum(b, c)
				}
				b = append(b, ']')
			}
			b = append(b, '}')
		}
		b = append(b, ']')
	}
	b = append(b, `,"centres":`...)
	if j.Centres == nil {
		b = append(b, "null"...)
	} else {
		b = append(b, '[')
		for i := range j.Centres {
			c := &j.Centres[i]
			if i > 0 {
				b = append(b, ',')
			}
			b = append(b, `{"atom":`...)
			b = strconv.AppendInt(b, int64(c.Atom), 10)
			b = append(b, `,"element":`...)
			b = appendString(b, c.Element)
			b = append(b, `,"type":`...)
			b = appendString(b, c.Type)
			b = append(b, `,"h":`...)
			b = appendNum(b, c.H)
			b = append(b, `,"electrons":`...)
			b = strconv.AppendInt(b, int64(c.Electrons), 10)
			b = append(b, `,"charge":`...)
			b = appendNum(b, c.Charge)
			b = append(b, `,"fragment":`...)
			b = strconv.AppendInt(b, int64(c.Fragment), 10)
			b = append(b, '}')
		}
		b = append(b, ']')
	}
	b = append(b, `,"fragments":`...)
	b = strconv.AppendInt(b, int64(j.Fragments), 10)
	b = append(b, `,"warnings":`...)
	if j.Warnings == nil {
		b = append(b, "null"...)
	} else {
		b = append(b, '[')
		for i, w := range j.Warnings {
			if i > 0 {
				b = append(b, ',')
			}
			b = appendString(b, w)
		}
		b = append(b, ']')
	}
	c := &j.Calibration
	b = append(b, `,"calibration":{"name":`...)
	b = appendString(b, c.Name)
	b = append(b, `,"occupied_intercept_ev":`...)
	b = appendNum(b, c.HOMOIntercept)
	b = append(b, `,"occupied_slope_ev":`...)
	b = appendNum(b, c.HOMOSlope)
	b = append(b, `,"empty_intercept_ev":`...)
	b = appendNum(b, c.LUMOIntercept)
	b = append(b, `,"empty_slope_ev":`...)
	b = appendNum(b, c.LUMOSlope)
	b = append(b, `,"r2":`...)
	b = appendNum(b, c.R2)
	b = append(b, `,"rmse_ev":`...)
	b = appendNum(b, c.RMSE)
	b = append(b, `,"n":`...)
	b = strconv.AppendInt(b, int64(c.N), 10)
	b = append(b, `,"source":`...)
	b = appendString(b, c.Source)
	return append(b, "}}"...)
}
