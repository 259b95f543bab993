package settle.reports.html.sections;

import java.util.HashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import settle.reports.html.Axis;
import settle.reports.text.Format;
import settle.reports.html.HtmlWriter;
import settle.reports.html.Palette;
import settle.reports.html.SvgChart;
import settle.reports.metrics.ArmNudges;
import settle.reports.metrics.StudyAnalysis;
import settle.reports.format.Manifest;
import settle.reports.format.Replicate;
import settle.reports.format.Study;

/**
 * The page being drawn, as every section sees it: the writer, the analysed study, and the drawing helpers the
 * sections share (paragraphs, an arm's swatch and table row header, table heads, the legend, notes under charts,
 * the marks of nudges and plateau cuts). Every string goes through {@link HtmlWriter}, which escapes it.
 */
public final class Drawing {

    /** Width of a full-width chart (rates, objective, strip plots), in pixels. */
    static final double WIDE = 880;
    /** Most points a full-width chart draws per series before it thins them (a third of the cap on points). */
    static final int MAX_BUCKETS = 200;

    private final HtmlWriter w;
    private final StudyAnalysis analysis;

    /**
     * @param w the writer the page goes to
     * @param analysis the analysed study
     */
    public Drawing(HtmlWriter w, StudyAnalysis analysis) {
        this.w = w;
        this.analysis = analysis;
    }

    /** @return the writer */
    HtmlWriter writer() {
        return w;
    }

    /** @return the analysed study */
    StudyAnalysis analysis() {
        return analysis;
    }

    /** @return the study */
    Study study() {
        return analysis.study();
    }

    /** @return the study's manifest */
    Manifest manifest() {
        return analysis.study().manifest();
    }

    /** Writes one paragraph of text. */
    void para(String text) {
        w.element("p", text);
    }

    /** Writes arm a's swatch: its marker in its colour, hidden from screen readers. */
    void swatch(int a) {
        Palette.Style s = Palette.style(a);
        w.open("svg", "width", "14", "height", "14", "class", "swatch", "aria-hidden", "true");
        SvgChart.marker(w, 7, 7, 4, s.shape(), s.colour(), true, "swatch-mark", null);
        w.close("svg");
    }

    /** Writes a table row's header cell for arm a: its swatch and name. */
    void armHeader(int a) {
        w.open("th", "scope", "row");
        swatch(a);
        w.text(study().armName(a));
        w.close("th");
    }

    /** Writes a table's head: one row of column headers. */
    void tableHead(String... headings) {
        w.open("thead").open("tr");
        for (String h : headings) {
            w.element("th", h, "scope", "col");
        }
        w.close("tr").close("thead");
    }

    /** Writes the legend of the arms: each arm's marker (on a line of its dash when {@code lines}) and name. */
    void legend(boolean lines) {
        Study study = study();
        w.open("ul", "class", "legend");
        for (int a = 0; a < study.armCount(); a++) {
            w.open("li");
            SvgChart.legendSwatch(w, Palette.style(a), lines);
            w.text(study.armName(a));
            w.close("li");
        }
        w.close("ul");
    }

    /**
     * A note under a log chart whose axis could not hold every value (it spans at most {@value Axis#MAX_DECADES}
     * decades, keeping the largest): how many points are not drawn. Nothing when none.
     */
    void offAxisNote(int hidden, String what, Axis y) {
        if (hidden > 0) {
            w.element("p", hidden + " " + what + (hidden == 1 ? " lies" : "s lie") + " outside the drawn range ("
                    + Axis.format(y.min()) + " to " + Axis.format(y.max()) + ": a log axis spans at most "
                    + Axis.MAX_DECADES + " decades) and " + (hidden == 1 ? "is" : "are") + " not drawn.", "class",
                    "note chart-note");
        }
    }

    /**
     * One vertical marker (class "nudge") per nudge of every arm, at epoch {@code from − shift}: the rate chart
     * marks the nudge's first update (shift 0); the objective chart the end of the epoch before it (shift 1, the
     * last point before the nudge took effect; epoch 1 for a nudge in force from the start). Markers at one epoch
     * are stacked in rows (at most 6).
     */
    void nudgeMarkers(SvgChart c, List<List<ArmNudges.Mark>> nudges, int shift) {
        Map<Integer, Integer> rows = new HashMap<>();
        for (int a = 0; a < nudges.size(); a++) {
            for (ArmNudges.Mark n : nudges.get(a)) {
                int x = Math.max(1, n.fromEpoch() - shift);
                int row = rows.merge(x, 1, Integer::sum) - 1;
                c.vertical(x, Palette.style(a), "nudge", "×" + Format.sig(n.factor()),
                        nudgeTooltip(n, study().armName(a)), Math.min(row, 5));
            }
        }
    }

    /** @return a nudge's tooltip: arm, factor, epoch, the resulting rate when known, the note when any */
    static String nudgeTooltip(ArmNudges.Mark n, String armName) {
        return armName + ": rate × " + Format.sig(n.factor()) + " from epoch " + n.fromEpoch()
                + (Double.isFinite(n.rate()) ? " (rate " + Format.sig(n.rate()) + ")" : "")
                + (n.note().isEmpty() ? "" : " — " + n.note());
    }

    /** @return a plateau cut's tooltip: arm, replicate, the first epoch at the reduced rate, the rate when known */
    static String cutTooltip(String armName, Replicate r, int fromEpoch, double rate) {
        return String.format(Locale.ROOT, "%s, replicate %d: rate cut from epoch %d", armName, r.replicate(),
                fromEpoch) + (Double.isFinite(rate) ? " to " + Format.sig(rate) : "");
    }
}
