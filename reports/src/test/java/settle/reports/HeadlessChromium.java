package settle.reports;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.io.File;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.TimeUnit;

/**
 * Debian's chromium, run headless on a page of ours by the browser tests ({@link ReportBrowserTest},
 * {@link CompareBrowserTest}): a fresh profile each time, no network, its console on stderr.
 */
final class HeadlessChromium {

    private static final long TIMEOUT_SECONDS = 120;

    private HeadlessChromium() {
    }

    /** What chromium printed: the page's DOM on stdout (with --dump-dom), its log on stderr. */
    record Result(String out, String log) {
    }

    /** @return the chromium on the PATH, or null when there is none (the browser tests then skip themselves) */
    static String find() {
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

    /**
     * Opens {@code page} and waits for chromium to finish; fails unless it exits 0.
     *
     * @param chromium {@link #find()}'s answer
     * @param scratch a directory for the profile and the captured output
     * @param windowSize e.g. {@code 1200,1600}
     * @param page the page
     * @param extra further switches (--dump-dom, --screenshot=…)
     */
    static Result browse(String chromium, Path scratch, String windowSize, Path page, String... extra)
            throws Exception {
        Path profile = Files.createTempDirectory(scratch, "profile");
        List<String> command = new ArrayList<>(List.of(chromium, "--headless", "--no-sandbox", "--disable-gpu",
                "--disable-background-networking", "--disable-component-update", "--disable-sync", "--no-first-run",
                "--user-data-dir=" + profile, "--enable-logging=stderr", "--v=0", "--window-size=" + windowSize));
        command.addAll(List.of(extra));
        command.add(page.toUri().toString());
        Path out = scratch.resolve("out-" + System.nanoTime());
        Path err = scratch.resolve("err-" + System.nanoTime());
        Process p = new ProcessBuilder(command).redirectOutput(out.toFile()).redirectError(err.toFile()).start();
        if (!p.waitFor(TIMEOUT_SECONDS, TimeUnit.SECONDS)) {
            p.destroyForcibly();
            throw new AssertionError("chromium did not finish in " + TIMEOUT_SECONDS + " s");
        }
        String log = Files.readString(err, StandardCharsets.UTF_8);
        assertEquals(0, p.exitValue(), "chromium exit code; stderr: " + log);
        return new Result(Files.readString(out, StandardCharsets.UTF_8), log);
    }
}
