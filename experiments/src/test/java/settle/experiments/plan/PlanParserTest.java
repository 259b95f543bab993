package settle.experiments.plan;

import settle.engine.text.NearMiss;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.net.URISyntaxException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import settle.engine.model.Activation;
import settle.engine.model.Initialisation;
import settle.engine.model.ModelSpec;
import settle.engine.train.Sampling;
import settle.engine.train.TrainingSettings;
import settle.datasets.table.TableOptions;
import settle.input.BadInputException;
import settle.reports.format.Grid;

class PlanParserTest {

    static Path resource(String name) {
        try {
            return Path.of(PlanParserTest.class.getResource("/plans/" + name).toURI());
        } catch (URISyntaxException e) {
            throw new IllegalStateException(e);
        }
    }

    static ParsedPlan text(String yaml) {
        return PlanParser.read(yaml, "plan.yaml", Path.of("/base/dir"));
    }

    @Test
    void designExamplePlanParsesAsWritten() {
        Plan plan = PlanParser.parse(resource("design-example.yaml"));
        assertEquals("wdbc-decay", plan.study());
        assertEquals(2026L, plan.seed());
        assertEquals(10, plan.replicates());
        assertEquals(new DataPlan("bundled:wdbc", "diagnosis", 0.2, 0.0, true), plan.data());
        // the example writes hidden and activation ("mlp only") beside kind: logistic: ignored, with warnings
        assertEquals(ModelSpec.Kind.LOGISTIC, plan.model().kind());
        assertEquals(List.of(), plan.model().hidden());
        assertEquals(null, plan.model().activation());
        assertEquals(Initialisation.ZEROS, plan.model().init());
        assertEquals(1.0e-3, plan.model().l2());
        assertEquals(new TrainingSettings(50, 32, Sampling.SHUFFLE, 0.0, 0.1, 50, false), plan.training());
        assertEquals("constant", plan.baseline());
        List<String> names = new ArrayList<>();
        for (ArmPlan a : plan.arms()) {
            names.add(a.name());
        }
        // reciprocal expanded in place: rate outer, decay inner (last key fastest), values spelled as written
        assertEquals(List.of("constant",
                "reciprocal[rate=0.05,decay=0.3]", "reciprocal[rate=0.05,decay=1.0]", "reciprocal[rate=0.05,decay=3.0]",
                "reciprocal[rate=0.1,decay=0.3]", "reciprocal[rate=0.1,decay=1.0]", "reciprocal[rate=0.1,decay=3.0]",
                "reciprocal[rate=0.2,decay=0.3]", "reciprocal[rate=0.2,decay=1.0]", "reciprocal[rate=0.2,decay=3.0]",
                "halving", "averaged"), names);
        assertEquals(ArmPlan.Averaging.TAIL, plan.arm("averaged").average());
        assertEquals(ArmPlan.Averaging.NONE, plan.arm("halving").average());
        Map<String, Object> s = plan.arm("reciprocal[rate=0.1,decay=3.0]").schedule().settings();
        assertEquals("reciprocal", s.get("kind"));
        assertEquals(0.1, s.get("rate"));
        assertEquals(3.0, s.get("decay"));
        assertEquals("epoch", s.get("per"));
    }

    @Test
    void designExampleWarnsAboutMlpKeysOfALogisticModel() {
        ParsedPlan parsed = PlanParser.read(resource("design-example.yaml"));
        String file = resource("design-example.yaml").toString();
        assertEquals(List.of(
                file + ":12:3: model.hidden: applies to kind: mlp only; ignored for this logistic model",
                file + ":13:3: model.activation: applies to kind: mlp only; ignored for this logistic model"),
                parsed.warnings());
    }

    @Test
    void minimalPlanGetsEveryDefault() {
        Plan plan = PlanParser.parse(resource("minimal.yaml"));
        assertEquals("minimal", plan.study(), "the study is named after the file");
        assertEquals(Defaults.SEED, plan.seed());
        assertEquals(10, plan.replicates());
        assertEquals(new DataPlan("synthetic:gaussian?rows=200&seed=3", null, 0.2, 0.0, true), plan.data());
        assertEquals(new ModelSpec(ModelSpec.Kind.LOGISTIC, List.of(), null, 1.0e-3, Initialisation.ZEROS),
                plan.model());
        assertEquals(new TrainingSettings(50, 32, Sampling.SHUFFLE, 0.0, 0.1, 50, false), plan.training());
        assertEquals(1, plan.arms().size());
        ArmPlan arm = plan.arms().get(0);
        assertEquals("constant", arm.name(), "an unnamed arm is named after its schedule kind");
        assertEquals("constant", plan.baseline(), "the first arm is the default baseline");
        assertEquals(ArmPlan.Averaging.NONE, arm.average());
        assertFalse(arm.manual());
    }

    @Test
    void mlpDefaults() {
        Plan plan = text("""
                data: {source: "synthetic:xor"}
                model: {kind: mlp}
                arms: [{schedule: {kind: constant, rate: 0.1}}]
                """).plan();
        assertEquals(new ModelSpec(ModelSpec.Kind.MLP, List.of(32), Activation.RELU, 1.0e-3,
                Initialisation.HE), plan.model());
    }

    @Test
    void gridExpandsInPlaceLastKeyFastestWithValuesAsWritten() {
        Plan plan = PlanParser.parse(resource("grid.yaml"));
        List<String> names = new ArrayList<>();
        for (ArmPlan a : plan.arms()) {
            names.add(a.name());
        }
        assertEquals(List.of("constant",
                "reciprocal[rate=0.05,decay=0.3]", "reciprocal[rate=0.05,decay=1.0]", "reciprocal[rate=0.05,decay=3e0]",
                "reciprocal[rate=0.1,decay=0.3]", "reciprocal[rate=0.1,decay=1.0]", "reciprocal[rate=0.1,decay=3e0]",
                "reciprocal[rate=0.2,decay=0.3]", "reciprocal[rate=0.2,decay=1.0]", "reciprocal[rate=0.2,decay=3e0]",
                "tailed"), names);
        for (int i = 1; i <= 9; i++) {
            Map<String, Object> s = plan.arms().get(i).schedule().settings();
            // rate = [0.05, 0.1, 0.2][(i − 1) / 3], decay = [0.3, 1.0, 3.0][(i − 1) % 3]
            assertEquals(new double[] {0.05, 0.1, 0.2}[(i - 1) / 3], (Double) s.get("rate"));
            assertEquals(new double[] {0.3, 1.0, 3.0}[(i - 1) % 3], (Double) s.get("decay"));
            assertEquals("epoch", s.get("per"), "keys not in the grid keep the template's value");
        }
        assertEquals(ArmPlan.Averaging.TAIL, plan.arm("tailed").average());
    }

    @Test
    void gridStructureIsKeptBesideThePlanWithIndicesAndValuesAsWritten() {
        ParsedPlan parsed = PlanParser.read(resource("grid.yaml"));
        List<Grid.Member> arms = new ArrayList<>();
        String[] rates = {"0.05", "0.1", "0.2"};
        String[] decays = {"0.3", "1.0", "3e0"};
        for (int i = 0; i < 9; i++) {
            arms.add(new Grid.Member(1 + i, List.of(rates[i / 3], decays[i % 3])));
        }
        assertEquals(List.of(new Grid("reciprocal", List.of("rate", "decay"),
                List.of(List.of(rates), List.of(decays)), arms)), parsed.grids());

        // Two entries, written in the opposite order of their arms, with a plain arm between: each entry keeps its
        // place in the plan's list and its arms' indices after expansion.
        ParsedPlan two = text("""
                data: {source: "synthetic:xor"}
                arms:
                  - {name: a, schedule: {kind: constant, rate: 0.1}}
                  - {name: b, schedule: {kind: reciprocal, rate: 0.2, decay: 1}}
                  - {name: "foo[a=1,b=2]", schedule: {kind: constant, rate: 0.3}}
                  - {name: d, schedule: {kind: exponential, rate: 0.2, base: 0.9}}
                grid:
                  - {arm: d, base: [0.5, 0.90]}
                  - {arm: b, rate: [0.1, 0.2]}
                """);
        assertEquals(List.of(
                new Grid("d", List.of("base"), List.of(List.of("0.5", "0.90")), List.of(
                        new Grid.Member(4, List.of("0.5")), new Grid.Member(5, List.of("0.90")))),
                new Grid("b", List.of("rate"), List.of(List.of("0.1", "0.2")), List.of(
                        new Grid.Member(1, List.of("0.1")), new Grid.Member(2, List.of("0.2"))))),
                two.grids());
        assertEquals("foo[a=1,b=2]", two.plan().arms().get(3).name(), "a plain arm, whatever its name");

        // The resolved plan has its grid expanded: read back, it has the same arms and no grid.
        ParsedPlan resolved = PlanParser.read(PlanWriter.toYaml(parsed.plan()), "plan.yaml", Path.of("/x"));
        assertEquals(parsed.plan(), resolved.plan());
        assertEquals(List.of(), resolved.grids());
        assertEquals(List.of(), text("""
                data: {source: "synthetic:xor"}
                arms: [{schedule: {kind: constant, rate: 0.1}}]
                """).grids());
    }

    @Test
    void gridMayAddAKeyTheTemplateLeftToItsDefault() {
        Plan plan = text("""
                data: {source: "synthetic:xor"}
                arms:
                  - {name: r, schedule: {kind: reciprocal, rate: 0.2, decay: 1}}
                grid:
                  - {arm: r, per: [epoch, update]}
                """).plan();
        assertEquals("r[per=epoch]", plan.arms().get(0).name());
        assertEquals("r[per=update]", plan.arms().get(1).name());
        assertEquals("update", plan.arms().get(1).schedule().settings().get("per"));
        assertEquals("r[per=epoch]", plan.baseline(), "the default baseline is the first arm after expansion");
    }

    @Test
    void baselineMayNameAnExpandedArm() {
        Plan plan = text("""
                data: {source: "synthetic:xor"}
                baseline: "r[rate=0.2]"
                arms:
                  - {name: r, schedule: {kind: constant, rate: 0.1}}
                grid:
                  - {arm: r, rate: [0.1, 0.2]}
                """).plan();
        assertEquals("r[rate=0.2]", plan.baseline());
        assertEquals(1, plan.baselineIndex());
    }

    @Test
    void relativeDataPathsResolveAgainstThePlanFolder(@TempDir Path dir) throws Exception {
        Path sub = Files.createDirectories(dir.resolve("plans"));
        Path plan = sub.resolve("p.yaml");
        Files.writeString(plan, """
                data: {source: csv:../data/train.csv, label: y}
                arms: [{schedule: {kind: constant, rate: 0.1}}]
                """);
        assertEquals("csv:" + dir.toAbsolutePath().normalize().resolve("data/train.csv"),
                PlanParser.parse(plan).data().source());
    }

    @Test
    void resolvedPlanWritesBackToAnEqualPlan() {
        for (String name : List.of("design-example.yaml", "minimal.yaml", "grid.yaml")) {
            Plan plan = PlanParser.parse(resource(name));
            String yaml = PlanWriter.toYaml(plan);
            Plan again = PlanParser.read(yaml, plan.study() + ".yaml", Path.of("/elsewhere")).plan();
            assertEquals(plan, again, name);
            assertEquals(yaml, PlanWriter.toYaml(again), name + ": canonical text is a fixed point");
            assertEquals(PlanWriter.sha256(plan), PlanWriter.sha256(again));
        }
    }

    @Test
    void tableKeysResolveWriteBackAndLeaveOtherPlansUnchanged() {
        Plan plan = PlanParser.read("""
                data:
                  source: csv:t.csv
                  features: [age, "1", colour]
                  drop: [colour]
                  categorical: ["1"]
                  max-levels: 12
                  missing: drop-rows
                arms: [{schedule: {kind: constant, rate: 0.1}}]
                """, "p.yaml", Path.of("/data")).plan();
        assertEquals(new TableOptions(List.of("age", "1", "colour"), List.of("colour"), List.of("1"), 12,
                TableOptions.Missing.DROP_ROWS), plan.data().table());
        String yaml = PlanWriter.toYaml(plan);
        assertTrue(yaml.contains("  features: [age, \"1\", colour]\n  drop: [colour]\n  categorical: [\"1\"]\n"
                + "  max-levels: 12\n  missing: drop-rows\n"), yaml);
        Plan again = PlanParser.read(yaml, "p.yaml", Path.of("/elsewhere")).plan();
        assertEquals(plan, again);
        assertEquals(PlanWriter.sha256(plan), PlanWriter.sha256(again));
        // without the keys: the defaults, and not one of them written, so existing plans keep their text and hash
        Plan plain = PlanParser.read("""
                data: {source: csv:t.csv}
                arms: [{schedule: {kind: constant, rate: 0.1}}]
                """, "p.yaml", Path.of("/data")).plan();
        assertEquals(TableOptions.DEFAULTS, plain.data().table());
        for (String key : List.of("features:", "drop:", "categorical:", "max-levels:", "missing:")) {
            assertFalse(PlanWriter.toYaml(plain).contains(key), key);
        }
    }

    @Test
    void roundTripKeepsAwkwardNamesAndMlpModels() {
        Plan plan = text("""
                study: odd
                seed: -7
                data: {source: "synthetic:xor?rows=100", label: null, holdout-fraction: 0.25}
                model: {kind: mlp, hidden: [16, 8], activation: tanh, l2: 0, init: glorot}
                training: {epochs: 3, batch: 7, sampling: replacement, momentum: 0.9, tail: 1, snapshots: 2}
                baseline: "yes"
                arms:
                  - {name: "yes", schedule: {kind: constant, rate: 1}}
                  - {name: "a \\"quoted\\" name: with colon, #hash", schedule: {kind: exponential, rate: 0.5, base: 0.9, per: update}, manual: true}
                  - {name: "0.5", schedule: {kind: power-law, rate: 0.3, power: 0.5, warmup: {epochs: 1}}}
                  - {name: "ünïcode\\ttab", schedule: {kind: reciprocal, rate: 0.3, decay: 2}}
                """).plan();
        assertTrue(plan.arms().get(1).manual());
        String yaml = PlanWriter.toYaml(plan);
        assertEquals(plan, PlanParser.read(yaml, "odd.yaml", Path.of("/x")).plan(), yaml);
    }

    @Test
    void hashChangesWithAnyResolvedValue() {
        Plan a = PlanParser.parse(resource("minimal.yaml"));
        Plan b = text("""
                study: minimal
                data: {source: "synthetic:gaussian?rows=200&seed=3"}
                training: {epochs: 51}
                arms: [{schedule: {kind: constant, rate: 0.1}}]
                """).plan();
        assertNotEquals(PlanWriter.sha256(a), PlanWriter.sha256(b));
        assertEquals(64, PlanWriter.sha256(a).length());
    }

    @Test
    void writtenDefaultsMatchTheExplicitPlan() {
        // every default spelled out gives the same resolved plan as leaving it out
        Plan explicit = text("""
                study: minimal
                seed: 1
                replicates: 10
                data: {source: "synthetic:gaussian?rows=200&seed=3", test-fraction: 0.2, holdout-fraction: 0.0, standardize: true}
                model: {kind: logistic, l2: 1.0e-3, init: zeros}
                training: {epochs: 50, batch: 32, sampling: shuffle, momentum: 0.0, tail: 0.1, snapshots: 50}
                baseline: constant
                arms: [{name: constant, schedule: {kind: constant, rate: 0.1}, average: none, manual: false}]
                """).plan();
        assertEquals(explicit, PlanParser.parse(resource("minimal.yaml")));
    }

    @Test
    void positionsFallBackToTheClosestWrittenKey() {
        ParsedPlan p = text("""
                data:
                  source: synthetic:xor
                arms:
                  - name: a
                    schedule: {kind: constant, rate: 0.1}
                """);
        assertEquals(List.of(2, 11), List.of(p.position("data.source")[0], p.position("data.source")[1]));
        assertEquals(5, p.position("arms[0].schedule.rate")[0]);
        assertEquals(1, p.position("data.label")[0], "an absent key reports its parent");
        BadInputException e = p.error("data.source", "cannot read");
        assertEquals("plan.yaml:2:11: data.source: cannot read", e.getMessage());
        assertThrows(IllegalArgumentException.class, () -> p.plan().arm("nope"));
    }

    @Test
    void writtenPlanFileParsesBackFromTheStudyDirectory(@TempDir Path dir) throws Exception {
        Plan plan = PlanParser.parse(resource("grid.yaml"));
        Path file = dir.resolve("plan.yaml");
        PlanWriter.write(plan, file);
        PlanWriter.write(plan, file); // over an existing file
        assertEquals(plan, PlanParser.parse(file));
        try (var s = Files.list(dir)) {
            assertEquals(1, s.count(), "no temporary file left behind");
        }
    }

    @Test
    void nearMissesCountTranspositionsAndIgnoreCase() {
        // OSA distance: one substitution, one transposition, one deletion, and a case change counts 0
        assertEquals(1, NearMiss.distance("exponental", "exponential"));
        assertEquals(1, NearMiss.distance("lable", "label"));
        assertEquals(3, NearMiss.distance("kitten", "sitting"), "Levenshtein's classic example: k→s, e→i, +g");
        assertEquals("epochs", NearMiss.closest("Epoch", List.of("epochs", "batch")));
        assertEquals(null, NearMiss.closest("zzz", List.of("epochs", "batch")));
    }

    @Test
    void gridErrorsPointAtTheOffendingValue() {
        BadInputException e = assertThrows(BadInputException.class, () -> text("""
                data: {source: "synthetic:xor"}
                arms:
                  - {name: r, schedule: {kind: reciprocal, rate: 0.2, decay: 1}}
                grid:
                  - arm: r
                    decay: [1, 2, fast]
                """));
        assertEquals("plan.yaml:6:19: grid[0].decay[2]: reciprocal: decay = 'fast' is not accepted; expected a number"
                + " (in arm 'r[decay=fast]')", e.getMessage());
        assertEquals(6, e.line());
        assertEquals(19, e.column());
        assertEquals("grid[0].decay[2]", e.key());
    }
}
