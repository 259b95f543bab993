package settle.reports;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Locale;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import settle.reports.html.HtmlWriter;
import settle.reports.html.ReportPage;

/** The report's structure, its escaping of user strings, and that it refers to nothing outside itself. */
class ReportHtmlTest {

    static final String ARM = "<script>alert(\"arm\")</script>";
    static final String FEATURE = "<script>alert('feature')</script>";
    static final int REPLICATES = 6;

    /** A study with a hostile arm name and feature name, a diverged replicate, a grid and tail snapshots. */
    static Path hostileStudy(Path dir) throws Exception {
        SyntheticStudy s = new SyntheticStudy();
        s.featureNames = List.of("air_temp", FEATURE);
        String[] names = {"constant", ARM, "reciprocal[rate=0.1,decay=0.3]", "reciprocal[rate=0.1,decay=1]",
            "reciprocal[rate=0.2,decay=0.3]", "reciprocal[rate=0.2,decay=1]"};
        for (int a = 0; a < names.length; a++) {
            List<SyntheticStudy.Rep> reps = s.arm(names[a], false, REPLICATES);
            double[] radius = new double[REPLICATES];
            for (int k = 0; k < REPLICATES; k++) {
                radius[k] = (1.0 + 0.1 * k) / (1 + a);
                SyntheticStudy.Rep r = reps.get(k);
                r.last = new double[] {0.1 * k, -0.2 * a, 0.05 * k * a};
                r.snapshotRows = 4;
                r.snapshots = new double[12];
                for (int j = 0; j < 12; j++) {
                    r.snapshots[j] = r.last[j % 3] + 0.01 * (j / 3) * (a + 1) * ((j % 3) - 1);
                }
                r.probabilities = new double[] {0.2 + 0.01 * k, 0.8 - 0.01 * k, 0.6, 0.4};
            }
            s.tailRadius(reps, radius);
        }
        s.replicates.get(1).get(2).status = "diverged";
        s.grid("reciprocal", 2, List.of("rate", "decay"), List.of(List.of("0.1", "0.2"), List.of("0.3", "1")));
        return s.write(dir.resolve("hostile"));
    }

    @TempDir
    Path dir;

    @Test
    void everySectionAndOneMarkPerReplicate() throws Exception {
        Path study = hostileStudy(dir);
        Report.write(study);
        String html = Files.readString(study.resolve("report.html"));
        for (String id : ReportPage.SECTIONS) {
            assertTrue(html.contains("<section id=\"" + id + "\">"), id);
        }
        assertEquals(6 * REPLICATES, countMarks(html, "strip-tail-radius"));
        assertEquals(6 * REPLICATES, countMarks(html, "strip-final-gap"));
        assertEquals(1, count(svg(html, "strip-tail-radius"), "class=\"replicate diverged\""));
        // The grid reciprocal[rate × decay] becomes heatmaps with 2 × 2 cells each.
        assertTrue(html.contains("id=\"heatmap-1\""));
        assertEquals(4, count(svg(html, "heatmap-1"), "class=\"cell\""));
        // Tail clouds are drawn for this small model.
        assertTrue(html.contains("id=\"chart-cloud-1\""));
    }

    @Test
    void theExecutorNamesItsThreadsOnceAndInTheRightNumber() throws Exception {
        SyntheticStudy local = new SyntheticStudy();
        local.finalGap(local.arm("constant", false, 2), new double[] {1.0, 2.0});
        local.executor = "local thread pool, 1 thread";
        Path one = local.write(dir.resolve("one"));
        Report.write(one);
        String html = Files.readString(one.resolve("report.html"));
        assertTrue(html.contains("local thread pool, 1 thread<"), "the local executor already says its threads");
        assertFalse(html.contains("threads)") || html.contains("(1 thread"), "no second, ungrammatical count");

        SyntheticStudy spark = new SyntheticStudy();
        spark.finalGap(spark.arm("constant", false, 2), new double[] {1.0, 2.0});
        spark.executor = "spark local[2]";
        spark.threads = 2;
        Path two = spark.write(dir.resolve("two"));
        Report.write(two);
        assertTrue(Files.readString(two.resolve("report.html")).contains("spark local[2] (2 threads)"));
    }

    @Test
    void userStringsAreShownAsTextAndNothingIsFetched() throws Exception {
        Path study = hostileStudy(dir);
        Report.write(study);
        String html = Files.readString(study.resolve("report.html"));
        assertFalse(html.toLowerCase(Locale.ROOT).contains("<script"), "no script element, from anywhere");
        assertTrue(html.contains("&lt;script&gt;alert(&quot;arm&quot;)&lt;/script&gt;"), "the arm name, escaped");
        assertTrue(html.contains("&lt;script&gt;alert(&#39;feature&#39;)&lt;/script&gt;"), "the feature name, escaped");
        assertTrue(html.contains("<meta http-equiv=\"Content-Security-Policy\" content=\"default-src &#39;none&#39;;"));
        assertNoExternalReference(html);
    }

    /** No URL, no resource attribute and no link except to the page's own sections. */
    static void assertNoExternalReference(String html) {
        String lower = html.toLowerCase(Locale.ROOT);
        assertFalse(lower.contains("http://") || lower.contains("https://") || lower.contains("//www."), "no URL");
        for (String attribute : new String[] {" src=", " srcset=", " action=", " poster=", "url(", "@import",
            "<link", "<iframe", "<object", "<embed", "<img"}) {
            assertFalse(lower.contains(attribute), attribute);
        }
        Matcher href = Pattern.compile(" href=\"([^\"]*)\"").matcher(html);
        while (href.find()) {
            assertTrue(href.group(1).startsWith("#"), "only in-page links: " + href.group(1));
        }
    }

    @Test
    void theWriterEscapesTextAndAttributesAndRefusesBadNames() {
        HtmlWriter w = new HtmlWriter(64);
        w.element("p", "a < b & \"c\"", "title", "x\" onload=\"y");
        assertEquals("<p title=\"x&quot; onload=&quot;y\">a &lt; b &amp; &quot;c&quot;</p>", w.toString());
        assertThrows(IllegalArgumentException.class, () -> new HtmlWriter(8).open("p onclick=x"));
        assertThrows(IllegalArgumentException.class, () -> new HtmlWriter(8).styleSheet("p{}</style><script>"));
        HtmlWriter open = new HtmlWriter(8).open("div");
        assertThrows(IllegalStateException.class, open::toString);
    }

    static String svg(String html, String id) {
        int from = html.indexOf("<svg id=\"" + id + "\"");
        assertTrue(from >= 0, "svg " + id);
        return html.substring(from, html.indexOf("</svg>", from));
    }

    static int countMarks(String html, String id) {
        return count(svg(html, id), "class=\"replicate") ;
    }

    static int count(String text, String needle) {
        int n = 0;
        for (int i = text.indexOf(needle); i >= 0; i = text.indexOf(needle, i + 1)) {
            n++;
        }
        return n;
    }
}
