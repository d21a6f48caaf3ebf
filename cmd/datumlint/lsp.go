package main

import (
	"github.com/spf13/cobra"

	"github.com/datumlint/datumlint/cmd/datumlint/internal/lsp"
)

func newLSPCmd() *cobra.Command {
	return &cobra.Command{
		Use:   "lsp",
		Short: "Run the language server (LSP over standard input and output) for editors",
		Long: `Run datumlint as a language server: the Language Server Protocol over standard input and
output, until the editor sends shutdown and exit. Open documents are checked as they are
typed, with the rules and the .datumlint.toml that check would use; hovers explain findings,
features and datums; definition, references, outline, completion, formatting (as fmt) and
quick fixes work on the text in the editor, which is never written to disk. Exit 0 after
shutdown and exit; 1 when exit comes, or the input ends, without shutdown.

docs/editors.md shows how to use it from Neovim, Helix, Emacs and VS Code.`,
		Args: cobra.NoArgs,
		RunE: func(cmd *cobra.Command, args []string) error {
			code := lsp.Serve(cmd.InOrStdin(), cmd.OutOrStdout(), lsp.Options{Version: version, Stderr: cmd.ErrOrStderr()})
			if code != 0 {
				return &exitError{code, ""}
			}
			return nil
		},
	}
}
