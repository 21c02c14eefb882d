package proportions

import "encoding/json"

// MarshalJSON writes the result with its stable field names; a statistic
// or log p-value that is infinite (a Wald-type z with zero variance, a
// p-value of exactly 0) is written as "Infinity"/"-Infinity", as for
// intervals (see JSONFloat), since JSON has no such numbers.
func (r TestResult) MarshalJSON() ([]byte, error) {
	type plain TestResult // no methods: avoids recursion
	return json.Marshal(struct {
		plain
		Statistic JSONFloat `json:"statistic"`
		PValue    JSONFloat `json:"p_value"`
		LogPValue JSONFloat `json:"log_p_value"`
	}{plain(r), JSONFloat(r.Statistic), JSONFloat(r.PValue), JSONFloat(r.LogPValue)})
}

// UnmarshalJSON reads what MarshalJSON writes.
func (r *TestResult) UnmarshalJSON(b []byte) error {
	type plain TestResult
	aux := struct {
		*plain
		Statistic JSONFloat `json:"statistic"`
		PValue    JSONFloat `json:"p_value"`
		LogPValue JSONFloat `json:"log_p_value"`
	}{plain: (*plain)(r)}
	if err := json.Unmarshal(b, &aux); err != nil {
		return err
	}
	r.Statistic, r.PValue, r.LogPValue = float64(aux.Statistic), float64(aux.PValue), float64(aux.LogPValue)
	return nil
}
