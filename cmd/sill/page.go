package main

import (
	"bytes"
	"context"
	"errors"
	"fmt"
	"io"

	"github.com/spf13/cobra"

	"github.com/sill-tool/sill/internal/analysis"
	"github.com/sill-tool/sill/internal/decision"
	"github.com/sill-tool/sill/internal/page"
	"github.com/sill-tool/sill/internal/review"
	"github.com/sill-tool/sill/internal/sharedfile"
)

// pageOut writes a sign-off page made by write to the file out, or to
// stdout when out is "" or "-". A file that is not a page sill wrote is
// never replaced.
func pageOut(ctx context.Context, out string, stdout, stderr io.Writer, write func(io.Writer) error) error {
	var b bytes.Buffer
	if err := write(&b); err != nil {
		return err
	}
	if out == "" || out == "-" {
		_, err := stdout.Write(b.Bytes())
		return err
	}
	_, err := sharedfile.Write(ctx, out, b.Bytes(), sharedfile.Options{Kind: page.Replaceable, Perm: 0o644})
	if errors.Is(err, sharedfile.ErrOtherKind) {
		return fmt.Errorf("--out: %w; remove it or write to another file", err)
	}
	if err != nil {
		return fmt.Errorf("--out: %w", err)
	}
	fmt.Fprintf(stderr, "sill: wrote the sign-off page to %s\n", out)
	return nil
}

// reviewPage writes the sign-off page of file, read from path, or with
// production (read from against) the page that sets it beside the
// decision in production.
func reviewPage(cmd *cobra.Command, file *decision.File, path string, production *decision.File, against, out string) error {
	return pageOut(cmd.Context(), out, cmd.OutOrStdout(), cmd.ErrOrStderr(), func(w io.Writer) error {
		if production == nil {
			return page.Write(w, file, page.Options{Name: path})
		}
		return page.WriteAgainst(w, review.Against(file, path, production, against))
	})
}

// page writes the sign-off page straight from the data: the decision
// built from the analysis result, as --save would write it, curve and
// all.
func (o *reportOptions) page(ctx context.Context, res *analysis.Result, stdout, stderr io.Writer) error {
	f, err := o.save.decision(res, "--format html")
	if err != nil {
		return err
	}
	for _, w := range analysis.WarningWords(res.Warnings, reportHints.LowerIsRiskier) {
		fmt.Fprintln(stderr, "sill: warning: "+w)
	}
	return pageOut(ctx, o.out, stdout, stderr, func(w io.Writer) error {
		return page.Write(w, f, page.Options{Name: res.Set.Source()})
	})
}
