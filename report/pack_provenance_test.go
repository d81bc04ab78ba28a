package report

import "testing"

func TestProvenance(t *testing.T) {
	for _, tc := range []struct{ in, text, marks string }{
		{"ABYC E-11, 11.14.2.6", "ABYC E-11, 11.14.2.6", ""},
		{"NEC 690.7, temperature-coefficient method (from memory; verify against the edition you work to)", "NEC 690.7, temperature-coefficient method", markRecalled},
		{"vented lead-acid cells, reference 25 °C (recalled; verify against the edition you work to)", "vented lead-acid cells, reference 25 °C", markRecalled},
		{"common practice: 50 % for lead-acid banks (common-practice; verify against the edition you work to)", "common practice: 50 % for lead-acid banks", markCommon},
		{"common practice (tolerance for nominal cell voltages)", "common practice (tolerance for nominal cell voltages)", markCommon},
		{"ISO 10133 (secondary; verify against the edition you work to); makers' data as recalled (recalled; verify against the edition you work to)", "ISO 10133; makers' data as recalled", markRecalled + markSecond},
	} {
		text, marks := provenance(tc.in)
		if text != tc.text || marks != tc.marks {
			t.Errorf("provenance(%q) = %q, %q; want %q, %q", tc.in, text, marks, tc.text, tc.marks)
		}
	}
}
