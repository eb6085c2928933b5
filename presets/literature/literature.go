// Package literature embeds cyclopair's literature check set, cases.yaml: experimental
// regiochemistry, reacting-site, endo/exo and electron-demand outcomes of thermal
// cycloadditions and one measured reactivity series, each with its source and confidence.
// check.LoadCheckSet (package fmo/check) reads it; `cyclopair validate` and the tests of
// package fmo/check run it. This file is the single copy of the check set (Go cannot embed
// files outside the package directory, so it lives here rather than under testdata/).
package literature

import _ "embed"

// CasesYAML is the content of cases.yaml.
//
//go:embed cases.yaml
var CasesYAML []byte

// CasesName is the name errors about CasesYAML use for it.
const CasesName = "presets/literature/cases.yaml"
