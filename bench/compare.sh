#!/bin/sh
# Runs the shared peer baseline (RDKit + numpy, a separate project: see its README for where to
# get it and what it needs) and cyclopair on the same generated library, in one run, and
# prints whole-process times, peak memory and the ratios. The figures in the README come from
# this script.
#
#   bench/compare.sh PEER_DIR [N] [LIBDIR]
#
# PEER_DIR  the peer's directory (gen_library.py, peer_baseline.py, refhmo.py); in the project
#           workspace it is ../shared/bench. It needs python3-rdkit and python3-numpy.
# N         dienes and dienophiles to screen (default 2000)
# LIBDIR    where the generated library lives (default /tmp/cyclopair-benchlib; made once with
#           the peer's generator, seed 1, 20,000 + 20,000 molecules, ~1 min)
#
# Needs: go, /usr/bin/time (GNU time, for max RSS), python3 with RDKit and numpy.
set -eu
PEER=${1:?usage: bench/compare.sh PEER_DIR [N] [LIBDIR]}
N=${2:-2000}
LIB=${3:-/tmp/cyclopair-benchlib}
PY=${PYTHON:-/usr/bin/python3}
HERE=$(cd "$(dirname "$0")/.." && pwd)
WORK=$(mktemp -d)
trap 'rm -rf "$WORK"' EXIT

if [ ! -s "$LIB/dienes.smi" ]; then
	mkdir -p "$LIB"
	"$PY" "$PEER/gen_library.py" --seed 1 --n-dienes 20000 --n-dienophiles 20000 --outdir "$LIB"
fi
(cd "$HERE" && go build -o "$WORK/cyclopair" ./cmd/cyclopair)
CP="$WORK/cyclopair"
head -n "$N" "$LIB/dienes.smi" | cut -d' ' -f1 >"$WORK/d.smi"
head -n "$N" "$LIB/dienophiles.smi" | cut -d' ' -f1 >"$WORK/e.smi"
head -n 5000 "$LIB/dienes.smi" | cut -d' ' -f1 >"$WORK/m5k.smi"

# measure NAME CMD...: wall seconds and max RSS (kB) of one whole process
measure() {
	name=$1
	shift
	/usr/bin/time -f "%e %M" -o "$WORK/$name.time" "$@" >"$WORK/$name.out" 2>"$WORK/$name.err" || {
		echo "$name failed:" >&2
		cat "$WORK/$name.err" >&2
		exit 1
	}
	read -r t m <"$WORK/$name.time"
	printf '%-34s %8.2f s %8.0f MB\n' "$name" "$t" "$((m / 1024))"
}
secs() { cut -d' ' -f1 "$WORK/$1.time"; }
ratio() { awk -v a="$(secs "$1")" -v b="$(secs "$2")" 'BEGIN { if (b > 0) printf "%.1f", a / b; else print "-" }'; }

echo "library: $N x $N from $LIB; machine: $(nproc) cores, load $(cut -d' ' -f1-3 /proc/loadavg)"
measure peer-dienes "$PY" "$PEER/peer_baseline.py" molecules --smi "$LIB/dienes.smi" --kind diene --limit "$N" --out "$WORK/fd.jsonl"
measure peer-dienophiles "$PY" "$PEER/peer_baseline.py" molecules --smi "$LIB/dienophiles.smi" --kind dienophile --limit "$N" --out "$WORK/fp.jsonl"
measure peer-pairs "$PY" "$PEER/peer_baseline.py" pairs --dienes "$WORK/fd.jsonl" --dienophiles "$WORK/fp.jsonl" --n-dienes "$N" --n-dienophiles "$N"
measure peer-orbitals-5000 "$PY" "$PEER/peer_baseline.py" molecules --smi "$LIB/dienes.smi" --kind diene --limit 5000 --out "$WORK/f5k.jsonl"
measure cyclopair-screen-1act "$CP" screen --dienes "$WORK/d.smi" --dienophiles "$WORK/e.smi" --top 20
measure cyclopair-screen-3act "$CP" screen --dienes "$WORK/d.smi" --dienophiles "$WORK/e.smi" --activate none,lewis,iminium --top 20
# the bounded top-K search (keys with a block bound; the default key rate has none yet)
measure cyclopair-screen-3act-normal_gap "$CP" screen --dienes "$WORK/d.smi" --dienophiles "$WORK/e.smi" --activate none,lewis,iminium --top 20 --rank-by normal_gap
measure cyclopair-screen-3act-normal_gap-exh "$CP" screen --dienes "$WORK/d.smi" --dienophiles "$WORK/e.smi" --activate none,lewis,iminium --top 20 --rank-by normal_gap --exhaustive
measure cyclopair-orbitals-5000-json sh -c "'$CP' orbitals - --format json <'$WORK/m5k.smi'"
cmp -s "$WORK/cyclopair-screen-3act-normal_gap.out" "$WORK/cyclopair-screen-3act-normal_gap-exh.out" && same=yes || same=NO
peer=$(awk -v a="$(secs peer-dienes)" -v b="$(secs peer-dienophiles)" -v c="$(secs peer-pairs)" 'BEGIN { printf "%.2f", a + b + c }')
echo
echo "peer molecules + pairs (one activation):  $peer s"
awk -v p="$peer" -v c="$(secs cyclopair-screen-1act)" 'BEGIN { printf "screen, 1 activation:   %.1fx the peer\n", p / c }'
awk -v p="$peer" -v c="$(secs cyclopair-screen-3act)" 'BEGIN { printf "screen, 3 activations:  %.1fx the peer (the peer does one)\n", p / c }'
awk -v p="$peer" -v c="$(secs cyclopair-screen-3act-normal_gap)" 'BEGIN { printf "screen, 3 activations, normal_gap:  %.1fx the peer\n", p / c }'
echo "bounded vs --exhaustive (normal_gap): $(ratio cyclopair-screen-3act-normal_gap-exh cyclopair-screen-3act-normal_gap)x faster, same rows: $same"
echo "orbitals, 5000 molecules, json: $(ratio peer-orbitals-5000 cyclopair-orbitals-5000-json)x the peer's whole process"
