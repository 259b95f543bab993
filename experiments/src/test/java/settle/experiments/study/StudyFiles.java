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

    /**
     * @return every replicate file {@code study/arms/ARM/R.json}, sorted by path. Reads names only (no file
     *     attributes), so a run writing beside it cannot make it fail: a partial file renamed between the listing
     *     and a stat would otherwise vanish under the walk.
     */
    public static List<Path> replicateFiles(Path study) throws Exception {
        List<Path> files = new ArrayList<>();
        try (var arms = Files.newDirectoryStream(study.resolve("arms"))) {
            for (Path arm : arms) {
                if (!Files.isDirectory(arm)) {
                    continue;
                }
                try (var entries = Files.newDirectoryStream(arm)) {
                    for (Path entry : entries) {
                        if (entry.getFileName().toString().endsWith(".json")) {
                            files.add(entry);
                        }
                    }
                }
            }
        }
        files.sort(null);
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
