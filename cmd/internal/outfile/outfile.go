// Package outfile is where the commands' output files used to be written;
// the work is now done by rampart/internal/atomicfile, shared with the
// library, and Write forwards to it so that command files need not change
// while they are being restructured.
//
// Deprecated: use rampart/internal/atomicfile.
package outfile

import "rampart/internal/atomicfile"

// Write is atomicfile.Write: the file at path is replaced whole or not at
// all, and a destination that is not a regular file is refused.
var Write = atomicfile.Write
