package settle.cluster;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.List;
import org.junit.jupiter.api.Test;

class SubmitTest {

    @Test
    void aRunWithoutClusterGetsSparkSubmitsMaster() {
        assertEquals(List.of("run", "p.yaml", "--out", "s", "--cluster", "yarn"),
                Submit.withMaster(new String[] {"run", "p.yaml", "--out", "s"}, "yarn"));
    }

    @Test
    void anExplicitClusterOrAnotherCommandIsLeftAlone() {
        assertEquals(List.of("run", "p.yaml", "--cluster=local[2]"),
                Submit.withMaster(new String[] {"run", "p.yaml", "--cluster=local[2]"}, "yarn"));
        assertEquals(List.of("check", "p.yaml"), Submit.withMaster(new String[] {"check", "p.yaml"}, "yarn"));
        assertEquals(List.of("run", "p.yaml"), Submit.withMaster(new String[] {"run", "p.yaml"}, null));
    }
}
