package settle.experiments.study;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assumptions.assumeTrue;

import java.io.IOException;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.concurrent.TimeUnit;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * The bytes of a study do not depend on the JDK: the same plan run on this JDK and on a JDK 19 or later (whose
 * {@code Double.toString} is the shortest form, unlike JDK 17's) gives the same replicate files, epochs.csv,
 * reference.json and summary.csv, byte for byte. Skipped, by assumption, where no second JDK of version 19 or later is
 * installed beside this one (this machine has Eclipse Adoptium 25 in /usr/lib/jvm).
 */
class OtherJdkTest {

    @TempDir
    Path dir;

    /** @return the java launcher of an installed JDK of version 19 or later other than this one, or null */
    private static Path otherJdk() throws IOException {
        Path here = Path.of(System.getProperty("java.home")).toRealPath();
        Path jvms = here.getParent();
        if (jvms == null || !Files.isDirectory(jvms)) {
            return null;
        }
        try (Stream<Path> s = Files.list(jvms)) {
            for (Path home : s.sorted().toList()) {
                Path java = home.resolve("bin/java");
                Path release = home.resolve("release");
                if (!Files.isExecutable(java) || !Files.isRegularFile(release) || home.toRealPath().equals(here)) {
                    continue;
                }
                for (String line : Files.readAllLines(release)) {
                    if (line.startsWith("JAVA_VERSION=\"")) {
                        String v = line.substring("JAVA_VERSION=\"".length());
                        int major = Integer.parseInt(v.split("[.\"]")[0]);
                        if (major >= 19) {
                            return java;
                        }
                    }
                }
            }
        }
        return null;
    }

    @Test
    void aStudyWrittenOnAnotherJdkIsTheSameByteForByte() throws Exception {
        Path java = otherJdk();
        assumeTrue(java != null, "no JDK 19 or later beside this one; the cross-JDK check is skipped");
        Path plan = dir.resolve("plan.yaml");
        Files.writeString(plan, StudyRunnerTest.plan("jdks", 3, ""));
        Path here = dir.resolve("here");
        assertEquals(0, StudyRunnerTest.settle(new StringWriter(), new StringWriter(), "run", plan.toString(), "--out",
                here.toString(), "--quiet", "--threads", "1"));
        Path there = dir.resolve("there");
        Process other = new ProcessBuilder(List.of(java.toString(), "-cp", System.getProperty("java.class.path"),
                "settle.experiments.cli.Main", "run", plan.toString(), "--out", there.toString(), "--quiet",
                "--threads", "1")).redirectErrorStream(true).redirectOutput(dir.resolve("other.log").toFile()).start();
        assertEquals(true, other.waitFor(300, TimeUnit.SECONDS));
        assertEquals(0, other.exitValue(), Files.readString(dir.resolve("other.log")));
        StudyFiles.assertSameReplicateFiles(here, there);
        for (String file : List.of("epochs.csv", "reference.json", "summary.csv")) {
            assertArrayEquals(Files.readAllBytes(here.resolve(file)), Files.readAllBytes(there.resolve(file)), file);
        }
    }
}
