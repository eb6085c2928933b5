package web

// The page's own HTML: the forms, the bar above a report and error pages. No scripts; the
// one style sheet of each page is allowed by its hash (send). The look follows the report:
// one dark hue, system fonts.

const pageCSS = `body { font-family: "DejaVu Sans", Arial, Helvetica, sans-serif; color: #1b1f24; margin: 1.5rem auto; max-width: 60rem; padding: 0 1rem; line-height: 1.4; font-size: 15px; }
h1 { font-size: 1.5rem; } h2 { font-size: 1.2rem; border-bottom: 1px solid #b8bec8; margin-top: 2rem; }
fieldset { border: 1px solid #b8bec8; margin: 0.8rem 0; } legend { font-weight: bold; }
label { display: block; margin: 0.4rem 0; } input[type=text] { width: 100%; max-width: 40rem; font-family: monospace; }
textarea { width: 100%; font-family: monospace; }
.inline label { display: inline; margin-right: 1rem; } button { font-size: 1rem; padding: 0.3rem 1.2rem; }
pre { background: #f3f4f6; padding: 0.6rem; overflow-x: auto; white-space: pre-wrap; } .hint { color: #4a5260; font-size: 0.9rem; }
.caution { border-left: 4px solid #2f4b6e; padding-left: 0.6rem; }`

const homeHTML = `<!DOCTYPE html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<link rel="icon" href="data:,">
<title>cyclopair</title>
<style>` + pageCSS + `</style>
</head>
<body>
<h1>cyclopair: frontier-orbital analysis of cycloaddition partners</h1>
<p class="caution">Estimates for planning only, not a safety assessment: check the SDS, a hazard review and local rules before any lab work.</p>

<h2 id="pair-form">One pair</h2>
<form action="/pair" method="get">
<label>Diene (4π partner: diene, hetero-diene or 1,3-dipole), SMILES or a built-in name
<input type="text" name="diene" id="diene" list="presets" required placeholder="C=CC(C)=C or cyclopentadiene"></label>
<label>Dienophile (2π partner), SMILES or a built-in name
<input type="text" name="dienophile" id="dienophile" list="presets" required placeholder="C=CC(=O)OC or maleic-anhydride"></label>
<fieldset class="inline"><legend>Activation of the dienophile</legend>
{{range $i, $m := .Modes}}<label><input type="checkbox" name="activate" value="{{$m}}"{{if eq $i 0}} checked{{end}}> {{$m}}</label>
{{end}}</fieldset>
{{if .Methods}}<label>π method <select name="method">{{range .Methods}}<option value="{{.}}">{{.}}</option>{{end}}</select></label>
{{end}}<button type="submit" id="pair-submit">Analyse the pair</button>
</form>
<datalist id="presets">{{range .Presets}}<option value="{{.}}"></option>{{end}}</datalist>

<h2 id="screen-form">A screen</h2>
<p class="hint">Either a substrate file (YAML, as for <code>cyclopair screen FILE.yaml</code>), or a diene list and a
dienophile list (SMILES lines, CSV/TSV with a header naming the smiles and name columns, or SD files), or both
(the lists then replace the file's). Paste the text or choose a file; at most {{.MaxUpload}} in all, {{.Timeout}} per analysis.</p>
<form action="/screen" method="post" enctype="multipart/form-data">
<fieldset><legend>Substrate file (YAML)</legend>
<label>Paste <textarea name="yaml" rows="6"></textarea></label>
<label>or upload <input type="file" name="yaml_file" id="yaml_file" accept=".yaml,.yml"></label>
</fieldset>
<fieldset><legend>Lists</legend>
<label>Dienes, pasted (one "SMILES name" per line) <textarea name="dienes" id="dienes" rows="5"></textarea></label>
<label>or upload <input type="file" name="dienes_file" id="dienes_file" accept=".smi,.smiles,.txt,.csv,.tsv,.sdf,.sd,.mol"></label>
<label>Dienophiles, pasted <textarea name="dienophiles" id="dienophiles" rows="5"></textarea></label>
<label>or upload <input type="file" name="dienophiles_file" id="dienophiles_file" accept=".smi,.smiles,.txt,.csv,.tsv,.sdf,.sd,.mol"></label>
<label>List format <select name="input_format"><option value="auto">by file extension (pasted text: SMILES lines)</option>{{range .ListFormats}}<option value="{{.}}">{{.}}</option>{{end}}</select></label>
<label>SD property holding the name (empty: the title line) <input type="text" name="name_field"></label>
</fieldset>
<fieldset class="inline"><legend>Activation (none ticked: the file's, else none)</legend>
{{range .Modes}}<label><input type="checkbox" name="activate" value="{{.}}"> {{.}}</label>
{{end}}</fieldset>
{{if .Methods}}<label>π method <select name="method"><option value="">the file's (else the default)</option>{{range .Methods}}<option value="{{.}}">{{.}}</option>{{end}}</select></label>
{{end}}<label>Show the best <input type="number" name="top" min="0" value="" placeholder="all"> rows</label>
<button type="submit" id="screen-submit">Run the screen</button>
</form>
</body>
</html>
`

const navCSS = `nav.serve { border-bottom: 1px solid #b8bec8; padding: 0.4rem 0 0.6rem; margin-bottom: 1rem; font-size: 0.95rem; }
nav.serve a { margin-right: 1rem; } nav.serve pre { background: #f3f4f6; padding: 0.5rem; white-space: pre-wrap; }`

const navHTML = `<nav class="serve"><a href="/">New analysis</a>{{if .Bookmark}}<a href="{{.Bookmark}}" id="bookmark">Link to this result</a>{{end}}Downloads:{{range .Downloads}} <a href="{{.Href}}" download="">{{.Label}}</a>{{end}}
{{if .Log}}<details open=""><summary>Messages from the run</summary><pre id="run-log">{{.Log}}</pre></details>{{end}}</nav>
`

const errorHTML = `<!DOCTYPE html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<link rel="icon" href="data:,">
<title>cyclopair: {{.Title}}</title>
<style>` + pageCSS + `</style>
</head>
<body>
<h1 id="error-title">{{.Title}}</h1>
{{if .Msg}}<p id="error-message">{{.Msg}}</p>{{end}}
{{if .Detail}}<pre id="error-detail">{{.Detail}}</pre>{{end}}
<p><a href="/">Back to the forms</a></p>
<p class="hint">HTTP status {{.Status}}</p>
</body>
</html>
`
