package settle.reports;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assumptions.assumeTrue;

import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import settle.reports.html.ReportPage;

/**
 * The report in a real browser: Debian's chromium, headless (installed by .ci/run). It loads report.html from
 * a file, the DOM it builds has every section and one mark per replicate in each strip plot, the hostile arm
 * and feature names are text (no script element), no console message or CSP violation is logged, and a
 * screenshot is kept in reports/target/browser/ as a build artefact. Skipped, by assumption, only where no
 * chromium is installed.
 */
class ReportBrowserTest {


    @TempDir
    Path dir;

    private HeadlessChromium.Result browse(String chromium, Path report, String... extra) throws Exception {
        return HeadlessChromium.browse(chromium, dir, "1280,2400", report, extra);
    }

    @Test
    void theBrowserShowsEverySectionEveryReplicateAndNoScript() throws Exception {
        String chromium = HeadlessChromium.find();
        assumeTrue(chromium != null, "chromium is not installed (.ci/run installs it); browser check skipped");
        Path study = ReportHtmlTest.hostileStudy(dir);
        Report.write(study);
        Path report = study.resolve("report.html");

        HeadlessChromium.Result dom = browse(chromium, report, "--dump-dom");
        String html = dom.out();
        for (String id : ReportPage.SECTIONS) {
            assertTrue(html.contains("<section id=\"" + id + "\">"), "section " + id + " in the DOM");
        }
        assertEquals(6 * ReportHtmlTest.REPLICATES, ReportHtmlTest.countMarks(html, "strip-tail-radius"));
        assertEquals(6 * ReportHtmlTest.REPLICATES, ReportHtmlTest.countMarks(html, "strip-final-gap"));
        assertFalse(html.toLowerCase(Locale.ROOT).contains("<script"), "the browser built no script element");
        assertTrue(html.contains("&lt;script&gt;alert(\"arm\")&lt;/script&gt;"), "the arm name is text");
        assertTrue(html.contains("&lt;script&gt;alert('feature')&lt;/script&gt;"), "the feature name is text");
        ReportHtmlTest.assertNoExternalReference(html);
        for (String line : dom.log().split("\n")) {
            assertFalse(line.contains("CONSOLE") || line.contains("Refused to") || line.contains("Content Security"
                    + " Policy"), "console message or CSP violation: " + line);
        }

        Path shots = Path.of("target", "browser");
        Files.createDirectories(shots);
        Path png = shots.resolve("report.png").toAbsolutePath();
        Files.deleteIfExists(png);
        browse(chromium, report, "--hide-scrollbars", "--screenshot=" + png);
        assertTrue(Files.size(png) > 10_000, "a screenshot was written: " + png);
        Files.copy(report, shots.resolve("report.html"), java.nio.file.StandardCopyOption.REPLACE_EXISTING);
    }

    /**
     * The page with its Content-Security-Policy removed (so that a script may run) and a script that measures, in the
     * first paragraph holding {@code marker}, where each word outside the isolated names is drawn: one line per word,
     * "word TAB left TAB top", in document order, in a {@code <pre id="measured">} appended to the body.
     */
    private static String measuring(String html, String marker) {
        String script = "<script>addEventListener('load', () => {"
                + "const p = [...document.querySelectorAll('p')].find(e => e.textContent.includes('" + marker + "'));"
                + "const rows = []; let depth = 0;"
                + "const walker = document.createTreeWalker(p, NodeFilter.SHOW_TEXT);"
                + "while (walker.nextNode()) { const n = walker.currentNode; let start = -1;"
                + "  for (let i = 0; i <= n.data.length; i++) {"
                + "    const c = i < n.data.length ? n.data[i] : ' ';"
                + "    if (c === '\\u2068') { depth++; } else if (c === '\\u2069') { depth--; }"
                + "    const inWord = depth === 0 && c !== '\\u2069' && !/\\s/.test(c);"
                + "    if (inWord && start < 0) { start = i; }"
                + "    if (!inWord && start >= 0) { const r = document.createRange(); r.setStart(n, start);"
                + "      r.setEnd(n, i); const b = r.getBoundingClientRect();"
                + "      rows.push(n.data.substring(start, i) + '\\t' + Math.round(b.left) + '\\t' + Math.round(b.top));"
                + "      start = -1; } } }"
                + "const out = document.createElement('pre'); out.id = 'measured'; out.textContent = rows.join('\\n');"
                + "document.body.appendChild(out); });</script>";
        int csp = html.indexOf("<meta http-equiv=\"Content-Security-Policy\"");
        String without = html.substring(0, csp) + html.substring(html.indexOf('>', csp) + 1);
        return without.replace("</body>", script + "</body>");
    }

    /**
     * An arm name holding a right-to-left override and one in Hebrew, in the sentence that names both: the words of
     * the sentence around the names are drawn in reading order, left to right and line by line (without the names'
     * isolation and the override made visible, everything after the override is drawn reversed).
     */
    @Test
    void rightToLeftNamesLeaveTheSentenceInOrder() throws Exception {
        String chromium = HeadlessChromium.find();
        assumeTrue(chromium != null, "chromium is not installed (.ci/run installs it); browser check skipped");
        SyntheticStudy s = new SyntheticStudy();
        int n = 8;
        double[] base = new double[n];
        double[] better = new double[n];
        for (int k = 0; k < n; k++) {
            base[k] = 1.0 + 0.01 * k;
            better[k] = 0.3 + 0.01 * k;
        }
        s.finalGap(s.arm("\u202Eevil override", false, n), base);
        s.finalGap(s.arm("\u05E9\u05DC\u05D5\u05DD 42", false, n), better);
        Path study = s.write(dir.resolve("rtl"));
        Report.write(study);
        String html = Files.readString(study.resolve("report.html"), StandardCharsets.UTF_8);
        String marker = "among the arms whose returned iterate ends detectably";
        assertTrue(html.contains(marker), "the pick names both arms");
        Path page = dir.resolve("measured.html");
        Files.writeString(page, measuring(html, marker), StandardCharsets.UTF_8);

        String dom = browse(chromium, page, "--dump-dom", "--virtual-time-budget=5000").out();
        int from = dom.indexOf("<pre id=\"measured\">");
        assertTrue(from >= 0, "the measuring script ran");
        String measured = dom.substring(from + "<pre id=\"measured\">".length(), dom.indexOf("</pre>", from))
                .replace("&lt;", "<").replace("&gt;", ">").replace("&quot;", "\"").replace("&amp;", "&");
        List<String> words = new ArrayList<>();
        int[] left = new int[measured.split("\n").length];
        int[] top = new int[left.length];
        int i = 0;
        for (String row : measured.split("\n")) {
            String[] f = row.split("\t");
            words.add(f[0]);
            left[i] = Integer.parseInt(f[1]);
            top[i] = Integer.parseInt(f[2]);
            i++;
        }
        assertEquals("Pick", words.get(0), words.toString());
        assertTrue(words.containsAll(List.of("among", "the", "arms", "baseline", "closest", "(median")), words.toString());
        for (int w = 1; w < words.size(); w++) {
            boolean sameLine = Math.abs(top[w] - top[w - 1]) <= 2;
            assertTrue(sameLine ? left[w] > left[w - 1] : top[w] > top[w - 1], "'" + words.get(w) + "' is drawn after '"
                    + words.get(w - 1) + "' in reading order: " + measured);
        }
    }
}
