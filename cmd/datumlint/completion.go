package main

import (
	"strings"

	"github.com/spf13/cobra"

	"github.com/datumlint/datumlint/rules"
)

// Shell completion of flag values. `datumlint completion SHELL` prints the
// script; cobra's hidden __complete command answers it, which is how the
// tests ask.

// fixedValues completes a flag from a fixed list, each with a description.
func fixedValues(pairs ...string) cobra.CompletionFunc {
	return func(*cobra.Command, []string, string) ([]string, cobra.ShellCompDirective) {
		var out []string
		for i := 0; i+1 < len(pairs); i += 2 {
			out = append(out, pairs[i]+"\t"+pairs[i+1])
		}
		return out, cobra.ShellCompDirectiveNoFileComp
	}
}

// ruleIDs completes rule identifiers, each with its summary. For a list
// flag (--enable a,b) the rules already written stay in front of the one
// being completed, and are not offered again.
func ruleIDs(_ *cobra.Command, _ []string, toComplete string) ([]string, cobra.ShellCompDirective) {
	done, prefix := "", toComplete
	if i := strings.LastIndexByte(toComplete, ','); i >= 0 {
		done, prefix = toComplete[:i+1], toComplete[i+1:]
	}
	written := map[string]bool{}
	for _, id := range strings.Split(done, ",") {
		written[id] = true
	}
	var out []string
	for _, r := range rules.All() {
		if strings.HasPrefix(r.ID, prefix) && !written[r.ID] {
			out = append(out, done+r.ID+"\t"+strings.ReplaceAll(r.Summary, "`", ""))
		}
	}
	return out, cobra.ShellCompDirectiveNoFileComp | cobra.ShellCompDirectiveNoSpace
}

func registerCheckCompletions(cmd *cobra.Command) {
	values := make([]string, 0, 2*len(formats))
	for _, f := range formats {
		values = append(values, f.name, f.help)
	}
	registerCompletions(cmd, map[string]cobra.CompletionFunc{
		"format": fixedValues(values...),
		"color":  fixedValues("auto", "colour on a terminal, unless NO_COLOR is set", "always", "colour even when NO_COLOR is set", "never", "no colour"),
	})
	registerRunCompletions(cmd)
}

// registerRunCompletions completes the flags of runFlags (check and
// report).
func registerRunCompletions(cmd *cobra.Command) {
	registerCompletions(cmd, map[string]cobra.CompletionFunc{
		"fail-on": fixedValues("error", "fail on errors only", "warning", "fail on warnings and errors (the default)", "info", "fail on any finding"),
		"enable":  ruleIDs,
		"disable": ruleIDs,
	})
}

func registerCompletions(cmd *cobra.Command, complete map[string]cobra.CompletionFunc) {
	for name, fn := range complete {
		if err := cmd.RegisterFlagCompletionFunc(name, fn); err != nil {
			panic(err) // a flag renamed without its completion
		}
	}
}
