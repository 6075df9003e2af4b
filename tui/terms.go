package tui

// explorerTerms are the words and marks the explorer shows, each with what
// it means: the help's pages after the keys (README's glossary says the
// same).
var explorerTerms = []term{
	{"cut", "the score from which a case is flagged: flag score >= cut (<= with --lower-is-riskier); a case flagged is an alert a person works"},
	{"true ●, false ·", "the outcome recorded for a case; the list's true column shows it"},
	{"▌ ▶ ━━ cut", "a flagged row; the rows of the cursor's tie group; the line under the last flagged row"},
	{"hit (list)", "the hit share a cut at that row's score would have"},
	{"measured", "measured on the validation set: counted on the cases given (cases flagged, hit share, wrong-alert share, false positive rate), with Wilson intervals and, after b, the redraws"},
	{"projected", "projected to production: carried over at the assumed base rate, volume and costs (alert rate, wrong-alert share at that base rate, queue and cost per shift); their intervals take those assumptions as given and carry only the validation set's sampling error"},
	{"hit share", "true cases flagged out of all true cases: recall"},
	{"wrong-alert share", "false cases among the alerts (the false discovery rate); precision is 1 minus it"},
	{"about k in d wrong", "the wrong-alert share as a plain fraction"},
	{"false positive rate", "false cases flagged out of all false cases"},
	{"alert rate", "the share of all cases flagged, projected at the base rate"},
	{"base", "the base rate: the share of true cases expected in production (the validation set's own unless given)"},
	{"95% a–b", "the interval of the figure at the confidence level: Wilson's for a measured share; for a projected figure Mercaldo et al.'s logit interval (wrong-alert share) or Wilson limits combined by the MOVER (alert rate, queue, cost)"},
	{"queue per shift", "alerts per shift at the volume (cases per shift); over or under cap: against the capacity the team works"},
	{"shifts: 9/10 ≤ k", "busy shifts (--time, --shifts; also 9 in 10 ≤ k): 9 production shifts in 10 queue at most k alerts, from production's own counting noise at the volume (noise only) plus the real spread between shifts the set shows beyond its sampling noise (+ s% spread); % over: shifts above capacity; the sample's busiest: its heaviest real shift, scaled"},
	{"queue90", "the starting point where 9 shifts in 10 have at most the capacity's alerts"},
	{"cost per shift", "wrong alerts and misses (and hits, when given) at their costs, per shift at the volume"},
	{"net benefit", "true cases found minus wrong alerts weighted by the odds of the threshold probability, per case (decision-curve analysis, scores in [0,1] only)"},
	{"flag all, none", "the net benefit of flagging every case, and of flagging none (0), beside the cut's"},
	{"validation TP FP FN TN", "on the validation set: true cases flagged, false cases flagged, true cases missed, false cases left alone"},
	{"start 1-8", "the starting points: base (flag as many as the base rate), hit=0.8, wrong=0.333 (both on this set only), queue=capacity, least cost, queue90, then hit95=0.8 and wrong95=0.333 (95% sure); [n] is the cursor's"},
	{"redraws a–b", "after b: the range 9 resampled sets in 10 give the measured share beside it at this very cut, held fixed (the bootstrap); ░ on the chart"},
	{"where the rule lands", "after b: the rule applied again to each resampled set, its cut moving with it: the range of the cut and its workload and hit share (hit=0.8 stays near 80% by construction), how steady the rule is, not how precise the share is"},
	{"steady", "after b: the starting point's cut keeps its workload and hit share within a factor of 1.25 across resampled sets (fairly steady: 1.6; unsteady: more); thresholds of this tool's own convention, no published source"},
	{"ref, pt", "in the strip, differences from the chosen candidate (ref); shares differ in percentage points"},
	{"◆ ◇", "the chosen candidate; a pinned one on the chart"},
	{"ROC AUC", "how often a true case outranks a false one; 0.5 is chance; (a–b): its interval at the confidence level, from DeLong's variance"},
	{"AP", "average precision: the precision at each true case found, averaged over the true cases; (a–b): its logit interval at the confidence level"},
}
