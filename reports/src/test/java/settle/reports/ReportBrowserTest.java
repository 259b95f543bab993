package settle.reports;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assumptions.assumeTrue;

import java.io.File;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.TimeUnit;
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

    private static final long TIMEOUT_SECONDS = 120;

    @TempDir
    Path dir;

    private static String chromium() {
        for (String name : new String[] {"chromium", "chromium-browser"}) {
            for (String p : System.getenv().getOrDefault("PATH", "").split(File.pathSeparator)) {
                Path c = Path.of(p, name);
                if (Files.isExecutable(c)) {
                    return c.toString();
                }
            }
        }
        return null;
    }

    private Result browse(String chromium, Path report, String... extra) throws Exception {
        Path profile = Files.createTempDirectory(dir, "profile");
        List<String> command = new ArrayList<>(List.of(chromium, "--headless", "--no-sandbox", "--disable-gpu",
                "--disable-background-networking", "--disable-component-update", "--disable-sync", "--no-first-run",
                "--user-data-dir=" + profile, "--enable-logging=stderr", "--v=0", "--window-size=1280,2400"));
        command.addAll(List.of(extra));
        command.add(report.toUri().toString());
        Path out = dir.resolve("out-" + System.nanoTime());
        Path err = dir.resolve("err-" + System.nanoTime());
        Process p = new ProcessBuilder(command).redirectOutput(out.toFile()).redirectError(err.toFile()).start();
        if (!p.waitFor(TIMEOUT_SECONDS, TimeUnit.SECONDS)) {
            p.destroyForcibly();
            throw new AssertionError("chromium did not finish in " + TIMEOUT_SECONDS + " s");
        }
        assertEquals(0, p.exitValue(), "chromium exit code; stderr: " + Files.readString(err));
        return new Result(Files.readString(out, StandardCharsets.UTF_8), Files.readString(err, StandardCharsets.UTF_8));
    }

    private record Result(String out, String log) {
    }

    @Test
    void theBrowserShowsEverySectionEveryReplicateAndNoScript() throws Exception {
        String chromium = chromium();
        assumeTrue(chromium != null, "chromium is not installed (.ci/run installs it); browser check skipped");
        Path study = ReportHtmlTest.hostileStudy(dir);
        Report.write(study);
        Path report = study.resolve("report.html");

        Result dom = browse(chromium, report, "--dump-dom");
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
}
