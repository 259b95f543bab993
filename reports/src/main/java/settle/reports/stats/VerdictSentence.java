package settle.reports.stats;

import java.math.BigDecimal;
import java.math.MathContext;
import java.math.RoundingMode;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;

/**
 * Plain sentences for a {@link Comparison}, for example "reduces final gap by 64 % (Bonferroni 99 % CI 58–70 %,
 * adjusted p = 0.002)", "increases test accuracy by 0.9 percentage points (95 % CI +0.4 to +1.5 pp, p = 0.01)" or
 * "no difference detected with 6 pairs (change −3 %, 95 % CI −10 to +4 %, p = 0.41; 10 pairs needed to detect one
 * with 20 arms)". The sentence has no subject: the caller puts the arm's name before it. Plain text: escaping for
 * HTML is the renderer's job.
 *
 * <p>Coherence: the interval shown beside a p is adjusted the same way (Bonferroni level 1 − (1 − c)/m, labelled
 * so when m &gt; 1), and a sentence claims a difference only when the adjusted p and the interval agree: "reduces" or
 * "increases" needs adjusted p ≤ α and an interval on that side of no change; "no difference detected" needs
 * adjusted p &gt; α and an interval that holds no change. When ties or pairs with a diverged replicate (which count
 * in the test but not in the interval) make the two disagree, the sentence says so and claims nothing.
 *
 * <p>Numbers: two significant digits (whole numbers from 10 on); a change whose magnitude rounds below 0.005 prints
 * as 0; a reduction of 99.95 % or more prints as "&gt; 99.9 %" (signed: "&lt; −99.9 %").
 */
public final class VerdictSentence {

    private static final MathContext TWO_DIGITS = new MathContext(2, RoundingMode.HALF_UP);
    private static final double SMALLEST_SHOWN_P = 1e-4;
    private static final double LEVEL_SLACK = 1e-9;
    /** Changes of smaller magnitude (in % or percentage points) print as 0. */
    static final double SHOWN_ZERO = 0.005;
    /** % reductions from this magnitude on print as "> 99.9". */
    private static final double NEAR_ALL = 99.95;

    private VerdictSentence() {
    }

    /** What a comparison says, as its sentence claims it. */
    public enum Outcome {
        /** Detected, and the arm's values are the lower ones (adjusted p and interval agree). */
        LOWER,
        /** Detected, and the arm's values are the higher ones. */
        HIGHER,
        /** Every pair tied. */
        SAME,
        /** No difference detected. */
        NO_DIFFERENCE,
        /** The test and its interval disagree (ties, diverged pairs): nothing claimed. */
        UNCLEAR,
        /** No usable pair. */
        NOT_COMPARED
    }

    /**
     * @param c the comparison (null: not compared)
     * @return what its sentence claims, by the same rules as {@link #render}
     */
    public static Outcome outcome(Comparison c) {
        if (c == null || (c.testPairs() == 0 && c.effectPairs() == 0)) {
            return Outcome.NOT_COMPARED;
        }
        if (c.testPairs() == 0 && c.zeroDifferences() == c.effectPairs()) {
            return Outcome.SAME;
        }
        if (c.detected() && reachesLevel(c) && effectAgrees(c)) {
            return c.armLarger() ? Outcome.HIGHER : Outcome.LOWER;
        }
        if (!c.detected() && (!reachesLevel(c) || !c.intervalExcludesZero())) {
            return Outcome.NO_DIFFERENCE;
        }
        return Outcome.UNCLEAR;
    }

    /**
     * @param c a comparison with an effect
     * @return the metric, its signed change, its interval and p, as "final gap −92 %, Bonferroni 99 % CI −95 to
     *     −88 %, adjusted p = 0.0024" (no interval when the pairs are too few for its level)
     */
    public static String detail(Comparison c) {
        String change = c.metric() + " " + signedChange(c, c.estimate());
        return reachesLevel(c) ? change + ", " + ciText(c, true) + ", " + pText(c) : change + ", " + pText(c);
    }

    /**
     * @param c the comparison
     * @return one sentence, without subject and without final full stop
     */
    public static String render(Comparison c) {
        String main;
        boolean effectShown = false;
        int tied = c.zeroDifferences();
        int compared = c.pairs() - c.bothDiverged();
        if (c.testPairs() == 0 && c.effectPairs() == 0) {
            main = "cannot be compared on " + c.metric() + ": no usable pair of replicates";
        } else if (c.testPairs() == 0 && tied == c.effectPairs()) {
            main = "has the same " + c.metric() + " as the baseline in all " + c.effectPairs() + " pairs";
            effectShown = true;
        } else if (c.detected() && reachesLevel(c) && effectAgrees(c)) {
            main = (c.armLarger() ? "increases " : "reduces ") + c.metric() + " by " + size(c) + " ("
                    + ciText(c, false) + ", " + pText(c) + ")";
            effectShown = true;
        } else if (!c.detected() && (!reachesLevel(c) || !c.intervalExcludesZero())) {
            main = tied > 0 ? "no difference detected: " + tied + " of " + compared + " pairs tied, " + c.testPairs()
                    + " left for the test" : "no difference detected with " + c.testPairs() + " pair"
                    + (c.testPairs() == 1 ? "" : "s");
            if (c.effectPairs() > 0 && reachesLevel(c)) {
                main += " (change " + signedChange(c, c.estimate()) + ", " + ciText(c, true) + ", " + pText(c);
                effectShown = true;
            } else if (c.effectPairs() > 0 && c.exact().isDefined()) {
                main += " (change " + signedChange(c, c.estimate()) + "; " + c.effectPairs() + " pairs are too few for a "
                        + levelText(c) + " interval; " + pText(c);
                effectShown = true;
            } else {
                main += " (" + pText(c);
            }
            if (c.testPairs() < c.pairsNeeded()) {
                main += "; " + c.pairsNeeded() + (tied > 0 ? " untied" : "") + " pairs needed to detect one"
                        + (c.arms() > 1 ? " with " + c.arms() + " arms" : "");
            }
            main += ")";
        } else {
            main = "no difference claimed: the test (" + pText(c) + ") and its interval (" + (c.exact().isDefined()
                    ? "change " + signedChange(c, c.estimate()) + ", " + ciText(c, true) : "none") + ") disagree, "
                    + disagreementCause(c);
            effectShown = true;
        }
        List<String> notes = new ArrayList<>();
        if (c.bothDiverged() > 0) {
            notes.add(count(c.bothDiverged(), "pair", "pairs") + " where both replicates diverged dropped");
        }
        if (c.setAside() > 0) {
            notes.add("effect from " + c.effectPairs() + " finite pairs, " + c.setAside()
                    + " with a diverged replicate set aside (" + c.armDiverged() + " of the arm, "
                    + c.baselineDiverged() + " of the baseline, counted as worst in the test)");
        }
        if (tied > 0 && c.testPairs() > 0 && effectShown && !main.contains(" pairs tied")) {
            notes.add(tied + " of " + compared + " pairs tied (dropped from the test)");
        }
        if (c.clamped() > 0) {
            notes.add(count(c.clamped(), "value", "values") + " below the floor "
                    + String.format(Locale.ROOT, "%.0e", c.floor()) + " raised to it");
        }
        StringBuilder sb = new StringBuilder(main);
        for (String note : notes) {
            sb.append("; ").append(note);
        }
        return sb.toString();
    }

    /**
     * @return true when the exact interval reaches the adjusted level (with very few pairs the widest interval the
     *     signed-rank distribution allows covers less, and is then the interval of a laxer test than the p's)
     */
    private static boolean reachesLevel(Comparison c) {
        return c.exact().isDefined() && c.exact().level() + LEVEL_SLACK >= c.level();
    }

    /** @return true when the estimate and the whole interval lie on the side the ranks say */
    private static boolean effectAgrees(Comparison c) {
        if (c.effectPairs() == 0 || !c.exact().isDefined()) {
            return false;
        }
        double low = c.exact().low();
        double high = c.exact().high();
        return c.armLarger() ? (c.estimate() > 0 && low > 0) : (c.estimate() < 0 && high < 0);
    }

    private static String disagreementCause(Comparison c) {
        List<String> causes = new ArrayList<>();
        if (c.setAside() > 0) {
            causes.add(c.setAside() + " pair" + (c.setAside() == 1 ? "" : "s") + " with a diverged replicate count in"
                    + " the test but not in the interval");
        }
        if (c.zeroDifferences() > 0) {
            causes.add(c.zeroDifferences() + " tied pair" + (c.zeroDifferences() == 1 ? "" : "s")
                    + " are dropped from the test but not from the interval");
        }
        if (causes.isEmpty()) {
            causes.add("the test's tied ranks and the interval's untied distribution differ at the edge");
        }
        return String.join(" and ", causes);
    }

    /**
     * @param signedBounds true beside a signed change ("change −1.3 %, 95 % CI −2.6 to −0.16 %"); false after
     *     "reduces … by" or "increases … by", where the bounds are magnitudes of that change
     */
    private static String ciText(Comparison c, boolean signedBounds) {
        String body;
        double lo = c.scale().shown(c.exact().low());
        double hi = c.scale().shown(c.exact().high());
        String unit = " " + c.scale().unit();
        if (!signedBounds && lo > 0 && hi > 0) {
            body = magnitudeOf(c.scale(), lo) + "–" + magnitudeOf(c.scale(), hi) + unit;
        } else if (!signedBounds && lo < 0 && hi < 0) {
            body = magnitudeOf(c.scale(), hi) + "–" + magnitudeOf(c.scale(), lo) + unit;
        } else {
            body = signedOf(c.scale(), lo) + " to " + signedOf(c.scale(), hi) + unit;
        }
        return levelText(c) + " CI " + body;
    }

    /** @return "95 %" for one arm, "Bonferroni 99 %" for five: the level each arm's interval is taken at */
    private static String levelText(Comparison c) {
        String level = plainLevel(100.0 * c.level()) + " %";
        return c.arms() > 1 ? "Bonferroni " + level : level;
    }

    /** @return the p as shown: "adjusted p = 0.0024" with several arms, "p = 0.0024" with one */
    public static String pText(Comparison c) {
        String name = c.arms() > 1 ? "adjusted p" : "p";
        double p = c.arms() > 1 ? c.pAdjusted() : c.p();
        if (p < SMALLEST_SHOWN_P) {
            return name + " < " + plain(SMALLEST_SHOWN_P);
        }
        return name + " = " + plain(p);
    }

    private static String count(int n, String one, String many) {
        return n + " " + (n == 1 ? one : many);
    }

    /** @return the estimate's magnitude with its unit: "64 %", "> 99.9 %", "0.87 percentage points" */
    public static String size(Comparison c) {
        String m = magnitudeOf(c.scale(), c.change());
        return c.scale() == Scale.LOG_RATIO ? m + " %" : m + " percentage point" + (m.equals("1") ? "" : "s");
    }

    /** @return a change shown with its sign and unit: "−10 %", "+0.5 pp", "0 %" */
    private static String signedChange(Comparison c, double d) {
        return signedOf(c.scale(), c.scale().shown(d)) + " " + c.scale().unit();
    }

    /** @return |x| as shown: two significant digits, "0" near zero, "> 99.9" for a near-total % reduction */
    static String magnitudeOf(Scale scale, double x) {
        if (scale == Scale.LOG_RATIO && x <= -NEAR_ALL) {
            return "> 99.9";
        }
        return Math.abs(x) < SHOWN_ZERO ? "0" : plain(Math.abs(x));
    }

    /** @return x with an explicit sign ("+4", "−10", "0"; "< −99.9" for a near-total % reduction) */
    static String signedOf(Scale scale, double x) {
        if (scale == Scale.LOG_RATIO && x <= -NEAR_ALL) {
            return "< −99.9";
        }
        if (Math.abs(x) < SHOWN_ZERO) {
            return "0";
        }
        String s = plain(Math.abs(x));
        return (x < 0 ? "−" : "+") + s;
    }

    /** @return a confidence level in %: "95", "99", "98.3" (up to three significant digits, trailing zeros dropped) */
    private static String plainLevel(double percent) {
        return new BigDecimal(percent).round(new MathContext(3, RoundingMode.DOWN)).stripTrailingZeros()
                .toPlainString();
    }

    /** @return x ≥ 0 rounded to two significant digits (whole numbers from 10 on), plain notation */
    static String plain(double x) {
        if (!Double.isFinite(x)) {
            return "n/a";
        }
        if (x == 0.0) {
            return "0";
        }
        BigDecimal v = new BigDecimal(x).round(TWO_DIGITS);
        if (v.abs().compareTo(BigDecimal.TEN) >= 0) {
            v = v.setScale(0, RoundingMode.HALF_UP);
        }
        return v.stripTrailingZeros().toPlainString();
    }
}
