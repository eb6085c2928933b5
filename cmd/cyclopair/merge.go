package main

import (
	"errors"
	"fmt"
	"os"

	"github.com/spf13/cobra"

	"cyclopair/fmo"
	"cyclopair/fmo/screen"
	"cyclopair/huckel/smiles"
	"cyclopair/presets"
)

// newMergeCmd builds 'cyclopair merge': the global top K from ranked shard outputs.
func newMergeCmd(s *streams) *cobra.Command {
	var rankBy, params, calibration, amine, rateModel string
	var top int
	cmd := &cobra.Command{
		Use:   "merge SHARD... ",
		Short: "Merge ranked shard outputs of screen into the global top K",
		Long: `Merge reads the outputs of 'cyclopair screen --shard i/n --top K' (JSON Lines or CSV;
'-' reads stdin) and writes the global top K exactly as the unsharded screen would: the same
rows in the same order, ranks renumbered, in the shards' format. The rows are ordered by the
screen's ranking (key, then pair number); the key of each row is recomputed from its SMILES
and activation, so give merge the --rank-by, --params, --amine and --rate-model the shards
ran with.

Not exact with --allowed-only, which the screen applies after the cut to K.`,
		Example: `  # one shard per task of a batch-scheduler job array, then one merge
  cyclopair screen lib.yaml --top 50 --shard 3/8 --format json > part3.jsonl
  cyclopair merge part*.jsonl --top 50 > top50.jsonl`,
		Args: cobra.MinimumNArgs(1),
		RunE: func(c *cobra.Command, args []string) error {
			key, err := screen.ParseRankKey(rankBy)
			if err != nil {
				return &usageError{fmt.Errorf("--rank-by: %v", err)}
			}
			if top < 0 {
				return &usageError{errors.New("--top: must be 0 (all) or positive")}
			}
			p, err := resolveParams(params)
			if err != nil {
				return &inputError{err}
			}
			cal, err := resolveCalibration(s, calibration, p)
			if err != nil {
				return &inputError{err}
			}
			opts := fmo.NewOptions(p, cal, cal.Name)
			var act *fmo.ActivateOptions
			if amine != "" {
				am, err := smiles.Parse(amine)
				if err != nil {
					return &usageError{fmt.Errorf("--amine: %s: %v", amine, err)}
				}
				act = &fmo.ActivateOptions{Amine: am}
			}
			rm, err := loadRateModel(rateModel)
			if err != nil {
				return err
			}
			var format screen.MergeFormat
			var header []string
			var rows []screen.MergeRow
			for _, name := range args {
				in := s.in
				if name != "-" {
					f, err := os.Open(name)
					if err != nil {
						return &inputError{fmt.Errorf("%s: cannot open (%v)", name, errors.Unwrap(err))}
					}
					defer f.Close()
					in = f
				}
				f, h, r, err := screen.ReadShard(in, name)
				if err != nil {
					return &inputError{err}
				}
				if f == 0 {
					continue
				}
				if format != 0 && (f != format || len(h) != len(header)) {
					return &inputError{fmt.Errorf("%s: a different format from the inputs before it (merge shards of one screen)", name)}
				}
				format, header = f, h
				rows = append(rows, r...)
			}
			if format == 0 {
				return nil
			}
			if err := screen.MergeShardsModel(s.out, format, header, rows, key, top, opts, act, rm); err != nil {
				return &inputError{err}
			}
			return nil
		},
	}
	f := cmd.Flags()
	f.StringVar(&rankBy, "rank-by", "", "ranking `key` the shards used (default: the screen's default, rate)")
	f.IntVar(&top, "top", 0, "keep the best `K` rows (0: all)")
	f.StringVar(&params, "params", "", "parameter set `name` or YAML file the shards used (default "+presets.DefaultParams+")")
	f.StringVar(&calibration, "calibration", "", "x → eV calibration the shards used (`file`; ranks do not depend on it)")
	f.StringVar(&rateModel, "rate-model", "", "rate model `FILE` the shards ranked by with --rank-by rate (default: the bundled fit)")
	f.StringVar(&amine, "amine", "", "`SMILES` of the amine the shards used for iminium activation (default pyrrolidine)")
	return cmd
}
