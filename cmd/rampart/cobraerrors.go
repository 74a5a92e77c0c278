package main

import (
	"fmt"
	"regexp"
	"strings"

	"github.com/spf13/cobra"
)

// Cobra's own messages for a missing required flag and for a stray
// argument name neither what the flag is for nor what the command takes;
// explain rewrites them with the flag's meaning and the remedy.
var (
	requiredFlags = regexp.MustCompile(`^required flag\(s\) (.+) not set$`)
	strayArgument = regexp.MustCompile(`^unknown command "(.*)" for "(.+)"$`)
)

// explain returns err, reworded when it is one of cobra's terse messages
// about the command line args.
func explain(root *cobra.Command, args []string, err error) error {
	msg := err.Error()
	cmd, _, ferr := root.Find(args)
	if ferr != nil || cmd == nil {
		cmd = root
	}
	if m := requiredFlags.FindStringSubmatch(msg); m != nil {
		var parts []string
		for _, q := range strings.Split(m[1], ", ") {
			name := strings.Trim(q, `"`)
			part := "--" + name
			if f := cmd.Flags().Lookup(name); f != nil && f.Usage != "" {
				part += " (" + strings.ReplaceAll(f.Usage, "`", "") + ")"
			}
			parts = append(parts, part)
		}
		return fmt.Errorf("%s needs %s; see %s --help", cmd.Name(), strings.Join(parts, " and "), cmd.CommandPath())
	}
	if m := strayArgument.FindStringSubmatch(msg); m != nil && !cmd.HasSubCommands() {
		hint := ""
		if cmd.Flags().Lookup("scenario") != nil {
			hint = " (a scenario is given as --scenario FILE)"
		}
		return fmt.Errorf("%s: unexpected argument %q: the command takes flags only%s; see %s --help", cmd.Name(), m[1], hint, cmd.CommandPath())
	}
	return err
}
