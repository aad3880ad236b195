package measure

import (
	"io"
)

// ReadKnifeScan reads a knife-edge scan from a CSV table with units in
// the column names (see [ReadColumns]): the edge position x with a length
// unit (x_mm, x_um …), the transmitted power p in any one unit, written
// in its name for the reader (p_mW, p_V, p_counts; the unit is not
// converted, P0 and Pmax come back in it), and optionally its standard
// uncertainty sigma_p in the same unit; the scan's PowerUnit is the
// unit as written. The scan is checked by [KnifeEdgeFromScan]; errors
// here name the file, line and column.
func ReadKnifeScan(r io.Reader, source string) (KnifeScan, error) {
	cols, err := ReadColumns(r, source)
	if err != nil {
		return KnifeScan{}, err
	}
	var s KnifeScan
	if s.Positions, err = cols.Lengths("x"); err != nil {
		return KnifeScan{}, err
	}
	p, col, err := cols.Numbers("p")
	if err != nil {
		return KnifeScan{}, err
	}
	s.Powers, s.PowerUnit = p, col.Unit
	if cols.Has("sigma_p") {
		sp, scol, err := cols.Numbers("sigma_p")
		if err != nil {
			return KnifeScan{}, err
		}
		if scol.Unit != col.Unit {
			return KnifeScan{}, &ParamError{Where: cols.where(), Param: "column " + scol.Name, Value: scol.Unit,
				Reason: "must be in the unit of column " + col.Name + " (" + col.Unit + ")", Err: ErrInput}
		}
		s.PowerUncertainties = sp
	}
	return s, nil
}
