package settle.reports.html.sections;

import java.util.List;
import settle.reports.text.Format;
import settle.reports.html.HtmlWriter;
import settle.reports.html.Palette;
import settle.reports.html.SvgChart;
import settle.reports.metrics.GridTable;
import settle.reports.metrics.StudyAnalysis;
import settle.reports.stats.ArmSummary;
import settle.reports.format.Grid;
import settle.reports.format.Metric;

/**
 * "Grid": for each grid entry of the plan that expanded an arm into two or more (the manifest's {@code grid}; never
 * guessed from arm names), heatmaps of the median tail radius, final gap, test loss and test accuracy over the swept
 * keys ({@link GridTable}: one or two keys; a grid of more keys is named and left to the verdict table).
 */
final class GridSection implements Section {

    @Override
    public String id() {
        return "grid";
    }

    @Override
    public String navigation() {
        return "Grid";
    }

    @Override
    public String heading() {
        return "Grid";
    }

    @Override
    public void draw(Drawing d) {
        HtmlWriter w = d.writer();
        StudyAnalysis analysis = d.analysis();
        boolean drawn = false;
        int figure = 0;
        for (Grid grid : GridTable.inArmOrder(d.manifest().grids())) {
            if (grid.members().size() < 2) {
                continue;
            }
            List<String> keys = grid.keys();
            if (keys.size() > 2) {
                d.para("Arm " + grid.arm() + " is expanded over " + keys.size() + " keys (" + String.join(", ", keys)
                        + "): heatmaps are drawn for grids of one or two keys; see the verdict table.");
                continue;
            }
            GridTable table = GridTable.of(grid);
            w.element("h3", "Arm " + grid.arm() + " over " + String.join(" × ", keys));
            w.open("div", "class", "multiples");
            for (Metric m : List.of(analysis.primary(), Metric.TAIL_RADIUS, Metric.TEST_LOSS, Metric.TEST_ACCURACY)) {
                ArmSummary[] s = analysis.summaries(m);
                if (s == null) {
                    continue;
                }
                figure++;
                heatmap(w, "heatmap-" + figure, "median " + m.words(), table.rowKey(), table.rows(),
                        table.columnKey(), table.columns(), table.medians(s));
            }
            w.close("div");
            drawn = true;
        }
        if (!drawn) {
            d.para("The plan has no grid: no arm was expanded over hyperparameters (grid arms are named like "
                    + "reciprocal[rate=0.1,decay=0.3]).");
        }
    }

    /**
     * A grid heatmap: cells (row value × column value) coloured by the median metric, value written in the
     * cell; missing combinations left blank.
     */
    private static void heatmap(HtmlWriter w, String id, String title, String rowKey, List<String> rowValues,
            String columnKey, List<String> columnValues, double[][] cells) {
        double lo = Double.POSITIVE_INFINITY;
        double hi = Double.NEGATIVE_INFINITY;
        for (double[] r : cells) {
            for (double v : r) {
                if (Double.isFinite(v)) {
                    lo = Math.min(lo, v);
                    hi = Math.max(hi, v);
                }
            }
        }
        boolean log = lo > 0 && hi / lo > 20;
        double cw = 92;
        double ch = 34;
        double left = 120;
        double top = 44;
        double width = left + cw * columnValues.size() + 20;
        double height = top + ch * rowValues.size() + 16;
        w.open("figure", "class", "panel heat");
        w.open("svg", "id", id, "class", "chart heatmap", "viewBox", "0 0 " + SvgChart.n(width) + " "
                + SvgChart.n(height), "width", SvgChart.n(width), "height", SvgChart.n(height), "role", "img");
        w.element("title", title);
        w.element("text", columnKey, "class", "axis-title", "x", SvgChart.n(left + cw * columnValues.size() / 2), "y",
                "14", "text-anchor", "middle");
        w.element("text", rowKey, "class", "axis-title", "x", SvgChart.n(left - 10), "y", SvgChart.n(top - 6),
                "text-anchor", "end");
        for (int j = 0; j < columnValues.size(); j++) {
            w.element("text", columnValues.get(j), "class", "tick", "x", SvgChart.n(left + cw * (j + 0.5)), "y",
                    SvgChart.n(top - 8), "text-anchor", "middle");
        }
        for (int i = 0; i < rowValues.size(); i++) {
            double y = top + ch * i;
            w.element("text", rowValues.get(i), "class", "tick", "x", SvgChart.n(left - 10), "y",
                    SvgChart.n(y + ch / 2 + 4), "text-anchor", "end");
            for (int j = 0; j < columnValues.size(); j++) {
                double v = cells[i][j];
                double x = left + cw * j;
                if (!Double.isFinite(v)) {
                    w.empty("rect", "class", "cell empty", "x", SvgChart.n(x), "y", SvgChart.n(y), "width",
                            SvgChart.n(cw - 2), "height", SvgChart.n(ch - 2));
                    continue;
                }
                double t = hi > lo ? (log ? Math.log(v / lo) / Math.log(hi / lo) : (v - lo) / (hi - lo)) : 0.5;
                w.open("rect", "class", "cell", "x", SvgChart.n(x), "y", SvgChart.n(y), "width", SvgChart.n(cw - 2),
                        "height", SvgChart.n(ch - 2), "fill", Palette.sequential(t));
                w.element("title", rowKey + " " + rowValues.get(i) + ", " + columnKey + " " + columnValues.get(j) + ": "
                        + Format.sig(v));
                w.close("rect");
                w.element("text", Format.sig(v), "class", Palette.darkCell(t) ? "cell-text light" : "cell-text", "x",
                        SvgChart.n(x + cw / 2 - 1), "y", SvgChart.n(y + ch / 2 + 3), "text-anchor", "middle");
            }
        }
        w.close("svg");
        w.element("figcaption", title + " (darker is smaller)");
        w.close("figure");
    }
}
