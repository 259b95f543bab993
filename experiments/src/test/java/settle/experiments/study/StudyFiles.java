package settle.experiments.study;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;

/** Test helpers over the replicate files of a study directory. */
public final class StudyFiles {

    private StudyFiles() {
    }

    /** @return every replicate file under {@code study/arms}, sorted by path */
    public static List<Path> replicateFiles(Path study) throws Exception {
        List<Path> files = new ArrayList<>();
        try (var walk = Files.walk(study.resolve("arms"))) {
            walk.filter(p -> p.toString().endsWith(".json")).sorted().forEach(files::add);
        }
        return files;
    }

    /** Asserts that two study directories hold the same replicate files, byte for byte. */
    public static void assertSameReplicateFiles(Path a, Path b) throws Exception {
        List<Path> left = replicateFiles(a);
        List<Path> right = replicateFiles(b);
        assertEquals(left.size(), right.size());
        for (int i = 0; i < left.size(); i++) {
            assertEquals(a.relativize(left.get(i)), b.relativize(right.get(i)));
            assertArrayEquals(Files.readAllBytes(left.get(i)), Files.readAllBytes(right.get(i)),
                    "replicate file " + a.relativize(left.get(i)) + " differs");
        }
    }
}
