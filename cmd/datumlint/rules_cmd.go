package main

import (
	"fmt"
	"io"
	"strings"
	"text/tabwriter"

	"github.com/spf13/cobra"

	"github.com/datumlint/datumlint/rules"
)

func newRulesCmd() *cobra.Command {
	return &cobra.Command{
		Use:   "rules",
		Short: "List every rule with its default severity and summary",
		Args:  cobra.NoArgs,
		RunE: func(cmd *cobra.Command, _ []string) error {
			return listRules(cmd.OutOrStdout())
		},
	}
}

// listRules prints every rule: identifier, default severity, summary.
func listRules(w io.Writer) error {
	tw := tabwriter.NewWriter(w, 0, 4, 2, ' ', 0)
	for _, r := range rules.All() {
		fmt.Fprintf(tw, "%s\t%s\t%s\n", r.ID, r.Severity, strings.ReplaceAll(r.Summary, "`", ""))
	}
	return tw.Flush()
}

func newExplainCmd() *cobra.Command {
	return &cobra.Command{
		Use:   "explain [RULE]",
		Short: "Explain a rule: summary, rationale with its source, a bad and a good example",
		Long: `Explain a rule: its summary, rationale with its published source, a bad and a good
example. With no RULE, list the rules (as datumlint rules does). A rule named almost right
(another case, '_' for '-', a typo) gets a did-you-mean; an unknown rule exits 2.`,
		Args: cobra.MaximumNArgs(1),
		ValidArgsFunction: func(_ *cobra.Command, args []string, toComplete string) ([]string, cobra.ShellCompDirective) {
			if len(args) > 0 {
				return nil, cobra.ShellCompDirectiveNoFileComp
			}
			ids, _ := ruleIDs(nil, nil, toComplete)
			return ids, cobra.ShellCompDirectiveNoFileComp
		},
		RunE: func(cmd *cobra.Command, args []string) error {
			if len(args) == 0 {
				fmt.Fprintln(cmd.ErrOrStderr(), "datumlint explain RULE explains one of these rules:")
				return listRules(cmd.OutOrStdout())
			}
			r := rules.Lookup(args[0])
			if r == nil {
				if sg := rules.Suggest(args[0]); sg != "" {
					return &exitError{2, fmt.Sprintf("no rule %q; did you mean %q? (datumlint explain %s)", args[0], sg, sg)}
				}
				return &exitError{2, fmt.Sprintf("no rule %q: `datumlint rules` lists them", args[0])}
			}
			fmt.Fprint(cmd.OutOrStdout(), Explain(r))
			return nil
		},
	}
}

// Explain renders a rule's documentation as plain text.
func Explain(r *rules.Rule) string {
	var b strings.Builder
	fmt.Fprintf(&b, "%s (default severity: %s)\n\n", r.ID, r.Severity)
	fmt.Fprintf(&b, "%s\n\n", strings.ReplaceAll(r.Summary, "`", ""))
	fmt.Fprintf(&b, "%s\n\n", r.Rationale)
	fmt.Fprintf(&b, "Source: %s\n\n", r.Source)
	fmt.Fprintf(&b, "Fix: %s\n\n", strings.ReplaceAll(r.FixText(), "`", ""))
	fmt.Fprintf(&b, "Bad:\n%s\n\n", indent(r.Bad))
	fmt.Fprintf(&b, "Good:\n%s\n\n", indent(r.Good))
	b.WriteString(disclaimer + "\n")
	return b.String()
}

const disclaimer = `datumlint advises; it does not certify. The governing standard edition, the drawing's own
notes, local codes and qualified engineering judgement decide.`

func indent(s string) string {
	lines := strings.Split(s, "\n")
	for i, l := range lines {
		lines[i] = "    " + l
	}
	return strings.Join(lines, "\n")
}
