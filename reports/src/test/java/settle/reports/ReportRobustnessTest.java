package settle.reports;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import settle.reports.html.Axis;
import settle.reports.html.HtmlWriter;
import settle.reports.html.ReportPage;

/**
 * Guarded charts, always a report: a study whose files hold huge, tiny and non-finite values (a finite prediction
 * of 1.14e189, an unstable one, nulls in the distances, metrics and snapshots, rates from 1e-250 to 5000, gaps from
 * 1e-300 to 1e250) still gets every section, every coordinate inside its picture and every tick label a finite
 * number, each log axis within {@value Axis#MAX_DECADES} decades and the distance axis chosen from the measured
 * values; what is not drawn is said. The report is kept in reports/target/robustness/ to look at.
 */
class ReportRobustnessTest {

    private static final int REPLICATES = 3;
    private static final Pattern SVG = Pattern.compile("<svg id=\"([^\"]+)\"[^>]*viewBox=\"0 0 ([0-9.]+) ([0-9.]+)\"");
    private static final Pattern COORDINATE = Pattern.compile("\\s(x|y|x1|x2|y1|y2|cx|cy|r|width|height)=\"([^\"]*)\"");
    private static final Pattern PATH = Pattern.compile("\\sd=\"([^\"]*)\"");
    private static final Pattern NUMBER = Pattern.compile("-?[0-9]+(?:\\.[0-9]+)?");
    private static final Pattern TICK = Pattern.compile("<text class=\"tick\" x=\"([^\"]*)\" y=\"([^\"]*)\"[^>]*>([^<]*)"
            + "</text>");

    @TempDir
    Path dir;

    private Path hostileNumbers() throws Exception {
        SyntheticStudy s = new SyntheticStudy();
        List<SyntheticStudy.Rep> huge = s.arm("huge prediction", false, REPLICATES);
        List<SyntheticStudy.Rep> unstable = s.arm("unstable", false, REPLICATES);
        List<SyntheticStudy.Rep> holes = s.arm("holes", false, REPLICATES);
        List<SyntheticStudy.Rep> tiny = s.arm("tiny", false, REPLICATES);
        s.tailRadius(huge, 0.1, 0.2, 0.3);
        s.tailRadius(unstable, 0.1, 0.2, 0.3);
        s.tailRadius(holes, 0.1, 0.2, Double.NaN);
        s.tailRadius(tiny, 1e-20, 2e-20, 3e-20);
        for (SyntheticStudy.Rep r : huge) {
            r.predictedEpochs = new double[] {1.14e189, 3e150, 1e100, 1e50};
            r.predictedTail = 1e50;
            r.metrics.put("final_gap", 1e250);
        }
        for (SyntheticStudy.Rep r : unstable) {
            r.unstableFrom = 1;
            r.unstableProduct = 1136;
            r.largest = 1136;
            r.distance = new double[] {30, 100, 300, 1000};
        }
        for (SyntheticStudy.Rep r : holes) {
            r.distance = new double[] {Double.NaN, 0.5, Double.NaN, 0.2};
            r.rates = new double[20];
            for (int u = 0; u < 20; u++) {
                r.rates[u] = u < 10 ? 5000 : 1e-250;
            }
            r.snapshotRows = 3;
            r.snapshots = new double[] {0.1, 0.2, 0.3, Double.NaN, 0.2, 0.1, 0.3, 0.1, 0.2};
            r.metrics.put("final_gap", 1e-300);
        }
        for (SyntheticStudy.Rep r : tiny) {
            r.distance = new double[] {1e-10, 1e-20, 1e-30, 1e-40};
            r.predictedEpochs = new double[] {1e-22, 1e-42, 1e-62, 1e-82};
        }
        return s.write(dir.resolve("hostile numbers"));
    }

    @Test
    void everyChartStaysInsideItsPictureWithFiniteSaneAxes() throws Exception {
        Path study = hostileNumbers();
        Report.Outcome outcome = Report.write(study);
        assertEquals(List.of(), outcome.failedSections(), "every section drawn");
        String html = Files.readString(study.resolve("report.html"));
        Path kept = Path.of("target", "robustness");
        Files.createDirectories(kept);
        Files.copy(study.resolve("report.html"), kept.resolve("report.html"), StandardCopyOption.REPLACE_EXISTING);
        for (String id : ReportPage.SECTIONS) {
            assertTrue(html.contains("<section id=\"" + id + "\">"), id);
        }
        assertFalse(html.contains("could not be drawn"));
        int charts = assertSaneCharts(html);
        assertTrue(charts >= 10, "rates, objective, 4 distance panels, 2 strips, 4 clouds: " + charts);

        String distance = html.substring(html.indexOf("<section id=\"distance\">"),
                html.indexOf("<section id=\"wander\">"));
        // The shared distance axis is the measured values' top 12 decades (1e6 down to 1e-6): the huge prediction and
        // the tiny arm's deep values are off it, and the page says so.
        double[] ticks = ticks(ReportHtmlTest.svg(html, "chart-distance-1"));
        assertTrue(Arrays.stream(ticks).max().getAsDouble() <= 1e7, "no tick near 1e189: " + Arrays.toString(ticks));
        assertTrue(Arrays.stream(ticks).min().getAsDouble() >= 1e-7, Arrays.toString(ticks));
        assertTrue(distance.contains("4 measured and 8 predicted points lie outside the drawn range"), "the tiny arm's"
                + " 4 measured and 4 predicted epoch ends, the huge arm's 4 predicted ones, said: " + distance);
        assertFalse(ReportHtmlTest.svg(html, "chart-distance-2").contains("series predicted"),
                "nothing drawn of a prediction unstable from update 1");
        assertTrue(distance.contains("Unstable from update 1 (α·λmax = 1140 ≥ 2(1 + β) = 2)"));
        assertTrue(html.contains("1 finished replicate has no finite tail radius and is not drawn."));
        assertTrue(html.contains("rates lie outside the drawn range"), "rates of 1e-250 are below the rate axis");
    }

    @Test
    void aStudyWithNoReplicateYetIsDrawnWhole() throws Exception {
        // a run stopped before its first replicate finished leaves a manifest and no replicate file: every section
        // still draws (the rate chart's epochs come from the manifest's training, not from the replicates)
        SyntheticStudy s = new SyntheticStudy();
        s.arm("constant", false, REPLICATES);
        s.arm("cosine", false, REPLICATES);
        List<String> skip = new java.util.ArrayList<>();
        for (int a = 1; a <= 2; a++) {
            for (int k = 1; k <= REPLICATES; k++) {
                skip.add(a + "/" + k);
            }
        }
        Report.Outcome outcome = Report.write(s.write(dir.resolve("none"), skip.toArray(String[]::new)));
        assertEquals(List.of(), outcome.failedSections(), "every section drawn");
        assertEquals(2 * REPLICATES, outcome.missing());
    }

    @Test
    void axesIgnoreWhatCannotBeDrawnAndCapTheirSpan() {
        Axis wide = Axis.log(1e-300, 1e300, "v");
        assertTrue(wide.max() >= 0.999e300 && Math.log10(wide.max() / wide.min()) <= Axis.MAX_DECADES * 1.1,
                wide.min() + " " + wide.max());
        assertFalse(wide.contains(1e-200));
        // Measured 1e-3..1 first; a prediction of 1e-5..1.14e189 widens it only as far as 12 decades allow.
        Axis chosen = Axis.log(1e-3, 1, 1e-5, 1.14e189, "v");
        assertTrue(chosen.contains(1e-3) && chosen.contains(1) && chosen.contains(1e9) && !chosen.contains(1e10));
        Axis none = Axis.log(Double.NaN, Double.POSITIVE_INFINITY, Double.NaN, Double.NaN, "v");
        assertTrue(Double.isFinite(none.min()) && none.min() > 0 && none.max() > none.min());
        Axis linear = Axis.linear(-Double.MAX_VALUE, Double.MAX_VALUE, "v");
        assertTrue(Double.isFinite(linear.min()) && Double.isFinite(linear.max()) && linear.ticks().length > 1);
        assertEquals(2, Axis.linear(Double.NaN, 1, "v").ticks().length > 0 ? 2 : 0);
        Axis flat = Axis.linear(1e20, 1e20 + 1e5, "v");
        assertTrue(flat.ticks().length >= 2 && flat.ticks().length <= 40, Arrays.toString(flat.ticks()));
        assertEquals("10000", Axis.format(1e4), "plain, not 1.000e+04");
        assertEquals("1e12", Axis.format(1e12));
    }

    @Test
    void aRolledBackSectionLeavesNoTrace() {
        HtmlWriter w = new HtmlWriter(64);
        w.open("main");
        HtmlWriter.Mark mark = w.mark();
        w.open("section").open("svg").element("text", "half a chart");
        w.rollback(mark);
        w.element("p", "in its place").close("main");
        assertEquals("<main><p>in its place</p></main>", w.toString());
    }

    /**
     * Asserts that every svg of the page keeps every coordinate and path point inside its viewBox (a few pixels of
     * slack) and that every tick label is a finite number, the labels of a log axis within 12 decades (plus its
     * margins).
     *
     * @return the number of charts checked
     */
    static int assertSaneCharts(String html) {
        Matcher svg = SVG.matcher(html);
        int charts = 0;
        while (svg.find()) {
            String id = svg.group(1);
            double width = Double.parseDouble(svg.group(2));
            double height = Double.parseDouble(svg.group(3));
            String body = html.substring(svg.start(), html.indexOf("</svg>", svg.start()));
            Matcher c = COORDINATE.matcher(body);
            while (c.find()) {
                double v = Double.parseDouble(c.group(2));
                boolean horizontal = c.group(1).startsWith("x") || c.group(1).equals("cx") || c.group(1).equals("width");
                double limit = horizontal ? width : height;
                assertTrue(Double.isFinite(v) && v >= -10 && v <= limit + 10, id + ": " + c.group());
            }
            Matcher d = PATH.matcher(body);
            while (d.find()) {
                Matcher n = NUMBER.matcher(d.group(1));
                while (n.find()) {
                    double v = Double.parseDouble(n.group());
                    assertTrue(v >= -10 && v <= Math.max(width, height) + 10, id + ": path point " + v);
                }
            }
            double[] t = ticks(body);
            for (double v : t) {
                assertTrue(Double.isFinite(v), id + ": tick " + v);
            }
            if (body.contains("(log scale)") && t.length > 1) {
                double[] positive = Arrays.stream(t).filter(v -> v > 0).toArray();
                double span = Math.log10(Arrays.stream(positive).max().getAsDouble()
                        / Arrays.stream(positive).min().getAsDouble());
                assertTrue(span <= Axis.MAX_DECADES + 1, id + ": log ticks over " + span + " decades");
            }
            charts++;
        }
        return charts;
    }

    /** @return the values of a chart's tick labels */
    static double[] ticks(String svg) {
        List<Double> out = new ArrayList<>();
        Matcher t = TICK.matcher(svg);
        while (t.find()) {
            String label = t.group(3);
            if (label.matches("-?[0-9.]+(e-?[0-9]+)?")) {
                out.add(Double.parseDouble(label));
            } else {
                throw new AssertionError("a tick label that is not a number: " + label);
            }
        }
        return out.stream().mapToDouble(Double::doubleValue).toArray();
    }
}
