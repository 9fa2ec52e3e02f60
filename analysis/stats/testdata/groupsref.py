"""Reference values for analysis/stats/groups_test.go (TestCompareGroupLinesGrunfeld).

Run with Debian's Python: /usr/bin/python3 analysis/stats/testdata/groupsref.py
(statsmodels 0.13.5, patsy, pandas). Data: Grunfeld (1958) investment data
as shipped with statsmodels (statsmodels.api.datasets.grunfeld: 11 firms,
1935-1954), read by the Go test in place from statsmodels' grunfeld.csv.

  * slopes equal (group x x interaction): the "value:C(firm)" row of
    anova_lm(ols("invest ~ value * C(firm)", data).fit())  (type I; the
    interaction is the last term, so the type does not matter)
  * one line for all firms against a line per firm:
    anova_lm(ols("invest ~ value", data).fit(), ols("invest ~ value * C(firm)", data).fit())
  * pooled within-firm correlation: the correlation of the residuals of
    ols("invest ~ C(firm)") and ols("value ~ C(firm)"); its t is the t of
    "value" in ols("invest ~ value + C(firm)").fit() on n - G - 1 df.
"""
import numpy as np
import statsmodels
import statsmodels.api as sm
from statsmodels.formula.api import ols
from statsmodels.stats.anova import anova_lm

d = sm.datasets.grunfeld.load_pandas().data
print(f"statsmodels {statsmodels.__version__}; n = {len(d)}, firms = {d.firm.nunique()}")
full = ols("invest ~ value * C(firm)", data=d).fit()
a = anova_lm(full)
row = a.loc["value:C(firm)"]
print(f"slopes equal: F = {row.F!r} on ({int(row.df)}, {int(a.loc['Residual'].df)}) df, p = {row['PR(>F)']!r}")
cmp_ = anova_lm(ols("invest ~ value", data=d).fit(), full)
print(f"one line vs one per firm: F = {cmp_.F[1]!r} on ({int(cmp_.df_diff[1])}, {int(cmp_.df_resid[1])}) df, p = {cmp_['Pr(>F)'][1]!r}")
ey = ols("invest ~ C(firm)", data=d).fit().resid
ex = ols("value ~ C(firm)", data=d).fit().resid
rw = np.corrcoef(ex, ey)[0, 1]
anc = ols("invest ~ value + C(firm)", data=d).fit()
print(f"pooled within-firm r = {rw!r}; t of value in invest ~ value + C(firm) = {anc.tvalues['value']!r}, p = {anc.pvalues['value']!r}, df = {anc.df_resid!r}")
