package settle.datasets;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import settle.input.BadInputException;

class DataSourcesTest {

    @TempDir
    Path dir;

    @Test
    void csvRelativeToDirectoryWithChosenDelimiter() throws Exception {
        Files.writeString(dir.resolve("d.csv"), "a,b;y\n1;p\n2;q\n");
        Dataset d = DataSources.load("csv:d.csv?delimiter=semicolon", "y", dir);
        assertEquals(List.of("a,b"), d.featureNames());
        assertEquals("d.csv", d.name());
    }

    @Test
    void syntheticDefaultsAndParameters() {
        Dataset g = DataSources.load("synthetic:gaussian?rows=60&features=3&classes=3&seed=7", null, null);
        assertEquals(60, g.rows());
        assertEquals(3, g.features());
        assertEquals(1000, DataSources.load("synthetic:frost", null, null).rows());
        assertEquals(400, DataSources.load("synthetic:xor", null, null).rows());
    }

    @Test
    void badSourcesListWhatIsAccepted() {
        assertEquals("data source 'data.csv' has no known prefix; expected one of csv:, libsvm:, bundled:, synthetic: "
                + "(e.g. csv:data.csv, libsvm:data.txt, bundled:wdbc, synthetic:frost)",
                assertThrows(BadInputException.class, () -> DataSources.load("data.csv", null, null)).getMessage());
        assertEquals("synthetic:spiral: unknown generator 'spiral'; expected one of gaussian, xor, frost",
                assertThrows(BadInputException.class, () -> DataSources.load("synthetic:spiral", null, null)).getMessage());
        assertEquals("synthetic:xor?width=3: unknown parameter 'width'; expected rows, noise, seed",
                assertThrows(BadInputException.class, () -> DataSources.load("synthetic:xor?width=3", null, null)).getMessage());
        assertEquals("missing.csv: no such file",
                assertThrows(BadInputException.class, () -> DataSources.load("csv:missing.csv", null, dir)).getMessage());
    }
}
