package settle.reports.html;

import java.util.Locale;
import settle.reports.metrics.ArmNudges;
import settle.reports.study.Replicate;

/** The words of the marks the charts put on nudges and plateau cuts (their tooltips and labels). */
final class Marks {

    private Marks() {
    }

    /** @return a nudge marker's tooltip */
    static String tooltip(ArmNudges.Mark n, String armName) {
        return armName + ": rate × " + Format.sig(n.factor()) + " from epoch " + n.fromEpoch()
                + (Double.isFinite(n.rate()) ? " (rate " + Format.sig(n.rate()) + ")" : "")
                + (n.note().isEmpty() ? "" : " — " + n.note());
    }

    /** @return a nudge marker's label */
    static String label(ArmNudges.Mark n) {
        return "×" + Format.sig(n.factor());
    }

    /** @return a cut's tooltip */
    static String cutTooltip(String armName, Replicate r, int fromEpoch, double rate) {
        return String.format(Locale.ROOT, "%s, replicate %d: rate cut from epoch %d", armName, r.replicate(),
                fromEpoch) + (Double.isFinite(rate) ? " to " + Format.sig(rate) : "");
    }
}
