package settle.reports;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assumptions.assumeTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Locale;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import settle.reports.html.ComparePage;

/**
 * The page of {@code settle compare} in a real browser: Debian's chromium, headless (installed by .ci/run), as
 * {@link ReportBrowserTest} does for the report. The page loads from a file with no console message or CSP
 * violation, the DOM has every section, each forest plot has one row per study holding its arm (three studies,
 * one of them without the arm), a hostile study name is text, and a screenshot is kept in reports/target/browser/.
 * Skipped, by assumption, only where no chromium is installed.
 */
class CompareBrowserTest {

    private static final int N = 8;

    @TempDir
    Path dir;

    private Path study(String name, String sha, String... arms) throws Exception {
        SyntheticStudy s = new SyntheticStudy();
        s.study = name;
        s.planSha256 = sha;
        double[] base = new double[N];
        for (int k = 0; k < N; k++) {
            base[k] = 1.0 + 0.01 * k;
        }
        s.finalGap(s.arm("constant", false, N), base);
        for (int i = 0; i < arms.length; i++) {
            double[] v = new double[N];
            for (int k = 0; k < N; k++) {
                v[k] = base[k] * (0.2 + 0.5 * i + 0.3 * sha.length()) * (1 + 0.002 * k);
            }
            s.finalGap(s.arm(arms[i], false, N), v);
        }
        return s.write(dir.resolve("s" + sha.length() + sha.hashCode()));
    }

    private String browse(String chromium, Path page, String... extra) throws Exception {
        HeadlessChromium.Result r = HeadlessChromium.browse(chromium, dir, "1200,1600", page, extra);
        String log = r.log();
        for (String line : log.split("\n")) {
            assertFalse(line.contains("CONSOLE") || line.contains("Refused to") || line.contains("Content Security"
                    + " Policy"), "console message or CSP violation: " + line);
        }
        return r.out();
    }

    /** @return the number of forest rows in the forest plot whose heading names {@code arm} */
    private static int rows(String html, String arm) {
        int heading = html.indexOf("<h3>" + arm + " against constant</h3>");
        assertTrue(heading >= 0, "a forest plot of " + arm);
        int end = html.indexOf("</svg>", heading);
        Matcher m = Pattern.compile("<g class=\"forest-row\"").matcher(html.substring(heading, end));
        int n = 0;
        while (m.find()) {
            n++;
        }
        return n;
    }

    @Test
    void thePageLoadsAndEachForestPlotHasOneRowPerStudy() throws Exception {
        String chromium = HeadlessChromium.find();
        assumeTrue(chromium != null, "chromium is not installed (.ci/run installs it); browser check skipped");
        Path a = study("<script>alert('study')</script>", "a", "cosine", "halving");
        Path b = study("spam", "bb", "halving", "cosine");
        Path c = study("wine", "ccc", "cosine");
        Path page = dir.resolve("compare.html");
        Compare.write(List.of(a, b, c), page, dir.resolve("compare.csv"));

        String html = browse(chromium, page, "--dump-dom");
        for (String id : ComparePage.SECTIONS) {
            assertTrue(html.contains("<section id=\"" + id + "\">"), "section " + id + " in the DOM");
        }
        assertTrue(html.indexOf("id=\"summary\"") < html.indexOf("id=\"forest\"")
                && html.indexOf("id=\"forest\"") < html.indexOf("id=\"studies\""), "summary, forest plots, studies");
        assertEquals(3, rows(html, "cosine"), "cosine is in all three studies");
        assertEquals(2, rows(html, "halving"), "halving is in two");
        assertEquals(2, html.split("<svg", -1).length - 1, "one forest plot per shared arm");
        assertEquals(2, html.split("class=\"zero\"", -1).length - 1, "a line at no change in each plot");
        assertFalse(html.toLowerCase(Locale.ROOT).contains("<script"), "the browser built no script element");
        assertTrue(html.contains("&lt;script&gt;alert('study')&lt;/script&gt;"), "the study's name is text");
        ReportHtmlTest.assertNoExternalReference(html);

        Path shots = Path.of("target", "browser");
        Files.createDirectories(shots);
        Path png = shots.resolve("compare.png").toAbsolutePath();
        Files.deleteIfExists(png);
        browse(chromium, page, "--hide-scrollbars", "--screenshot=" + png);
        assertTrue(Files.size(png) > 10_000, "a screenshot was written: " + png);
        Files.copy(page, shots.resolve("compare.html"), java.nio.file.StandardCopyOption.REPLACE_EXISTING);
    }
}
