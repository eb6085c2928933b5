// Package molfile reads MDL molfiles (V2000 and V3000) and SD files into the molecule graph
// the SMILES reader produces, and writes a graph with 2D coordinates as a V2000 molfile or
// SD record.
//
// Sources: the CTfile format as published by A. Dalby, J. G. Nourse, W. D. Hounshell,
// A. K. I. Gushurst, D. L. Grier, B. A. Leland and J. Laufer, "Description of several
// chemical structure file formats used by computer programs developed at Molecular Design
// Limited", J. Chem. Inf. Comput. Sci. 32, 244–255 (1992), for V2000 and SD files; and
// BIOVIA, "CTfile Formats" (Dassault Systèmes BIOVIA, 2020 edition) for the V3000
// extended connection table and the current property lines.
//
// # Reading
//
// NewReader(r, opts).Read returns one Record at a time; ReadAll returns them all. A
// record is a molfile (three header lines, the counts line, the connection table, "M  END")
// followed, in an SD file, by data items ("> <NAME>", value lines, a blank line) and a line
// "$$$$". A plain molfile is a file of one record without the "$$$$".
//
// Supported:
//   - V2000 atom and bond blocks in their fixed columns; the atom symbol (any element as
//     spelled in the periodic table, D and T for ²H and ³H), the mass difference, the charge
//     code (1–3 for +3..+1, 5–7 for −1..−3, 4 a doublet radical), the valence field and the
//     atom-atom mapping number (kept as Atom.Map);
//   - the property lines M  CHG, M  RAD and M  ISO, which supersede the atom-block charges,
//     radicals and mass differences as the specification says;
//   - V3000 connection tables: "M  V30" lines with '-' continuations, COUNTS, the atom
//     block (index type x y z aamap with CHG=, RAD=, MASS=, VAL=) and the bond block, with
//     arbitrary atom indices;
//   - bond types 1, 2, 3 and 4 (aromatic). Aromatic bonds are kekulised with the SMILES
//     reader's matcher (smiles.Kekulize) under the rule an aromatic SMILES atom written
//     without brackets follows, so a molfile with aromatic bonds reads like the aromatic
//     SMILES of the same molecule, and a pyrrole-type N needs its hydrogen drawn as an atom
//     (the SMILES [nH]); atoms and bonds written as type 4 keep Aromatic set;
//   - implicit hydrogens from the valence model: the valence field when given, otherwise
//     the SMILES reader's default valences for neutral B C N O P S F Cl Br I and, for
//     charged atoms and the other main-group elements, the valences of the isoelectronic
//     neutral element (N+ like C, O− like F, C− like N, B− like C), the usual MDL
//     convention; metals and noble gases get none (see "Known differences");
//   - explicit hydrogen atoms: folded into their neighbour's hydrogen count when plain
//     (FoldHydrogens), kept as atoms with Options.KeepHydrogens, as the SMILES reader keeps
//     [H] atoms;
//   - SD data items in file order (Record.Props); the title line, or the data item named by
//     Options.NameProp, as Molecule.Name;
//   - line ends \n or \r\n, a last line without a line end, a last record without "$$$$".
//
// Read and ignored, each with a Record.Notes entry: bond stereo (wedges, CFG=), atom
// parities, query fields (hydrogen count, substitution, unsaturation, ring bond count,
// topology), S-groups (the atoms and bonds are read as drawn, abbreviations expanded as the
// file gives them), atom aliases and values, other property lines.
//
// Rejected with a positioned error: radicals and carbenes (M  RAD, charge code 4, RAD=, or
// a valence field that leaves electrons unpaired), as the SMILES reader rejects them;
// unknown element symbols; query atoms (A, Q, L, *, R#, atom lists) and query bond types
// 5–8; V3000 coordination and hydrogen bonds (types 9, 10) and multi-centre bonds;
// impossible valences and charges; aromatic bonds outside rings or without a Kekulé
// structure; records without atoms; bad counts lines; truncated records; records larger
// than Options.MaxRecordBytes.
//
// # Errors
//
// A bad record gives an *Error (or an ErrorList when it has several problems), wrapping one
// of the sentinels ErrEmpty, ErrSyntax, ErrUnknownElement, ErrKekulize, ErrValence,
// ErrRadical (the SMILES reader's values), ErrTruncated, ErrUnsupported, ErrTooLarge. It
// names the record number, the record's title, the file line and column, the atom where
// there is one, what is wrong and a hint: "12:32: record 3 (aniline): atom 2: unknown
// element \"Xx\" (check the element symbol)". Reading goes on with the next record:
// records are split at "$$$$" before they are parsed, so one bad record never spoils the
// next. The reader never panics.
//
// # Known differences from RDKit's reader
//
// Measured with the committed fixture (testdata/molfile, scripts/gen_molfile_fixture.py;
// TestValenceModel and TestExtraRecords list every case):
//   - a neutral metal or noble-gas atom without a valence field gets no hydrogens here
//     (RDKit, following the MDL model, makes a lone "Na" NaH);
//   - a neutral N with four single bonds reads as NH with valence 5, the SMILES reader's
//     organic-subset rule (RDKit rejects it);
//   - hypervalent charged main-group atoms follow the isoelectronic rule where RDKit has
//     element-specific lists: Cl+ and Br+ with three or four bonds take hydrogens, Si+,
//     Ge− and Sb± get the valences of Al, As, Te and Sn, and an iodide with bonds (the
//     centre of I3−) is rejected, as the SMILES reader rejects it;
//   - charge code 4 is a doublet radical, as the specification says, and is rejected;
//     RDKit reads it as no charge and no radical;
//   - a mass difference on vanadium counts from ⁵¹V, its most abundant isotope (RDKit's
//     table gives 50).
//
// RDKit's own writer sets the valence field wherever the hydrogen count is unusual, so
// files it writes read the same in both.
//
// # Writing
//
// Marshal, AppendSD and Writer write V2000 with Kekulé bond orders, charges on M  CHG,
// isotopes on M  ISO, atom maps, and the valence field wherever the default valence model
// would not give the hydrogen count back; the output is a function of the molecule, the
// coordinates and the data items only (no date stamp). Data item names are the caller's;
// the names this project writes itself start with "cyclopair_" (PropSMILES).
package molfile
