package settle.reports.stats;

import java.math.BigDecimal;
import java.math.MathContext;
import java.math.RoundingMode;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;

/**
 * Plain sentences for a {@link Comparison}, for example "reduces tail radius by 64 % (95 % CI 58–70 %,
 * p = 0.002)" or "no difference detected with 6 replicates (10 needed to detect one at this number of
 * arms)". The sentence has no subject: the caller puts the arm's name before it. Numbers are rounded
 * to two significant digits; with more than one arm the p shown is Holm-adjusted and says so. The
 * interval shown is the exact one; the bootstrap interval belongs in tables. Plain text: escaping for
 * HTML is the renderer's job.
 */
public final class VerdictSentence {

    private static final MathContext TWO_DIGITS = new MathContext(2, RoundingMode.HALF_UP);
    private static final double SMALLEST_SHOWN_P = 1e-4;
    private static final double LEVEL_SLACK = 1e-9;

    private VerdictSentence() {
    }

    /**
     * @param c the comparison
     * @return one sentence, without subject and without final full stop
     */
    public static String render(Comparison c) {
        String main;
        boolean effectShown = false;
        if (c.testPairs() == 0 && c.effectPairs() == 0) {
            main = "cannot be compared on " + c.metric() + ": no usable pair of replicates";
        } else if (c.testPairs() == 0 && c.zeroDifferences() == c.effectPairs()) {
            main = "has the same " + c.metric() + " as the baseline in all " + c.effectPairs() + " pairs";
            effectShown = true;
        } else if (c.detected()) {
            String verb = c.armLarger() ? "increases" : "reduces";
            if (effectAgrees(c)) {
                main = verb + " " + c.metric() + " by " + magnitude(c.percentChange()) + " % (" + ciText(c, false) + ", "
                        + pText(c) + ")";
                effectShown = true;
            } else {
                main = verb + " " + c.metric() + " (" + pText(c) + ")";
            }
        } else if (c.testPairs() < c.pairsNeeded()) {
            main = "no difference detected with " + c.testPairs() + " replicates (" + c.pairsNeeded()
                    + " needed to detect one at this number of arms)";
        } else {
            main = "no difference detected with " + c.testPairs() + " replicates";
            if (c.effectPairs() > 0 && c.exact().isDefined()) {
                main += " (change " + signed(c.percentChange()) + " %, " + ciText(c, true) + ", " + pText(c) + ")";
                effectShown = true;
            } else {
                main += " (" + pText(c) + ")";
            }
        }
        List<String> notes = new ArrayList<>();
        if (!effectShown && c.effectPairs() > 0 && c.exact().isDefined() && (c.detected() || c.testPairs() < c.pairsNeeded())) {
            notes.add("on the " + c.effectPairs() + " finite pairs the change is " + signed(c.percentChange())
                    + " % (" + ciText(c, true) + ")");
        }
        if (c.bothDiverged() > 0) {
            notes.add(count(c.bothDiverged(), "pair", "pairs") + " where both replicates diverged dropped");
        }
        if (c.setAside() > 0) {
            notes.add("effect from " + c.effectPairs() + " finite pairs, " + c.setAside()
                    + " with a diverged replicate set aside (" + c.armDiverged() + " of the arm, "
                    + c.baselineDiverged() + " of the baseline, counted as worst in the test)");
        }
        if (c.zeroDifferences() > 0 && c.testPairs() > 0) {
            notes.add(count(c.zeroDifferences(), "zero difference", "zero differences") + " dropped from the test");
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

    private static boolean effectAgrees(Comparison c) {
        if (c.effectPairs() == 0 || !c.exact().isDefined()) {
            return false;
        }
        double low = c.exact().low();
        double high = c.exact().high();
        return c.armLarger() ? (c.estimate() > 0 && low > 0) : (c.estimate() < 0 && high < 0);
    }

    /**
     * @param signedBounds true beside a signed change ("change −1.3 %, 95 % CI −2.6 to −0.16 %"); false after
     *     "reduces … by" or "increases … by", where the bounds are magnitudes of that change
     */
    private static String ciText(Comparison c, boolean signedBounds) {
        double lo = Comparison.percent(c.exact().low());
        double hi = Comparison.percent(c.exact().high());
        String body;
        if (signedBounds) {
            body = signed(lo) + " to " + signed(hi) + " %";
        } else if (lo > 0 && hi > 0) {
            body = magnitude(lo) + "–" + magnitude(hi) + " %";
        } else if (lo < 0 && hi < 0) {
            body = magnitude(hi) + "–" + magnitude(lo) + " %";
        } else {
            body = signed(lo) + " to " + signed(hi) + " %";
        }
        return level(c) + " % CI " + body;
    }

    private static String level(Comparison c) {
        double requested = c.bootstrap().level();
        double achieved = c.exact().level();
        double shown = achieved + LEVEL_SLACK >= requested ? requested : achieved;
        return plain(100.0 * shown);
    }

    private static String pText(Comparison c) {
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

    /** @return |x| to two significant digits, plain notation */
    static String magnitude(double x) {
        return plain(Math.abs(x));
    }

    /** @return x to two significant digits with an explicit sign ("+4", "−10", "0") */
    static String signed(double x) {
        String s = plain(Math.abs(x));
        if (s.equals("0")) {
            return "0";
        }
        return (x < 0 ? "−" : "+") + s;
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
