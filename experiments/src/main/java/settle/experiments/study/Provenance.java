package settle.experiments.study;

import java.io.IOException;
import java.net.URISyntaxException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;

/** Where the running tool came from, for the manifest. */
public final class Provenance {

    private Provenance() {
    }

    /** @return the tool version from the jar manifest, or "development build" */
    public static String version() {
        String v = Provenance.class.getPackage().getImplementationVersion();
        return v == null ? "development build" : v;
    }

    /**
     * @return the git commit of the checkout the tool was built in (the jar lives in
     *     {@code <checkout>/experiments/target/}), or "unknown" when it cannot be told
     */
    public static String gitCommit() {
        try {
            Path here = Path.of(Provenance.class.getProtectionDomain().getCodeSource().getLocation().toURI());
            for (Path dir = here.toAbsolutePath().getParent(); dir != null; dir = dir.getParent()) {
                Path git = dir.resolve(".git");
                if (Files.isDirectory(git)) {
                    return resolve(git);
                }
                if (Files.isRegularFile(git)) { // a worktree: "gitdir: <path>"
                    String line = Files.readString(git, StandardCharsets.UTF_8).trim();
                    if (line.startsWith("gitdir:")) {
                        return resolve(dir.resolve(line.substring(7).trim()));
                    }
                }
            }
        } catch (IOException | URISyntaxException | SecurityException | IllegalArgumentException e) {
            return "unknown";
        }
        return "unknown";
    }

    private static String resolve(Path gitDir) throws IOException {
        String head = Files.readString(gitDir.resolve("HEAD"), StandardCharsets.UTF_8).trim();
        if (!head.startsWith("ref:")) {
            return head;
        }
        String ref = head.substring(4).trim();
        for (Path base = gitDir; base != null; base = base.getParent()) {
            Path refFile = base.resolve(ref);
            if (Files.isRegularFile(refFile)) {
                return Files.readString(refFile, StandardCharsets.UTF_8).trim();
            }
            Path packed = base.resolve("packed-refs");
            if (Files.isRegularFile(packed)) {
                for (String line : Files.readAllLines(packed, StandardCharsets.UTF_8)) {
                    if (line.endsWith(" " + ref)) {
                        return line.substring(0, line.indexOf(' '));
                    }
                }
            }
            if (base.getFileName() != null && base.getFileName().toString().equals(".git")) {
                break;
            }
        }
        return "unknown";
    }

    /** @return the CPU model from /proc/cpuinfo where there is one, else the architecture */
    public static String cpuModel() {
        try {
            for (String line : Files.readAllLines(Path.of("/proc/cpuinfo"), StandardCharsets.UTF_8)) {
                if (line.startsWith("model name")) {
                    return line.substring(line.indexOf(':') + 1).trim();
                }
            }
        } catch (IOException | SecurityException e) {
            return System.getProperty("os.arch", "unknown");
        }
        return System.getProperty("os.arch", "unknown");
    }
}
