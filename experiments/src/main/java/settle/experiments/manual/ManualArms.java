package settle.experiments.manual;

import java.io.IOException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import settle.engine.schedule.NudgeLog;
import settle.experiments.plan.ArmPlan;
import settle.experiments.plan.Plan;
import settle.experiments.plan.PlanWriter;
import settle.input.BadInputException;
import settle.reports.format.AtomicFile;
import settle.reports.format.StudyFormat;

/**
 * Rules and records shared by everything that runs manual arms: the refusal any executor that cannot pause
 * replicates in this JVM calls, and {@code replay.yaml}.
 */
public final class ManualArms {

    /** The replay plan's file name in a study directory. */
    public static final String REPLAY_FILE = StudyFormat.REPLAY;

    private ManualArms() {
    }

    /** @return the 1-based indices of the plan's manual arms */
    public static List<Integer> indices(Plan plan) {
        List<Integer> out = new ArrayList<>();
        for (int i = 0; i < plan.arms().size(); i++) {
            if (plan.arms().get(i).manual()) {
                out.add(i + 1);
            }
        }
        return out;
    }

    /**
     * Refuses a plan with manual arms on an executor that cannot hold every replicate of an arm at each epoch
     * end in this JVM (a cluster engine). Call it before running anything.
     *
     * @param executor the executor's description, for the message
     * @throws BadInputException naming the first manual arm and what would be accepted
     */
    public static void refuseUnlessLocal(Plan plan, String executor) {
        for (ArmPlan a : plan.arms()) {
            if (a.manual()) {
                throw BadInputException.of("--cluster", "arm " + BadInputException.shown(a.name()) + " is manual: its replicates must pause"
                        + " together at each epoch end to take nudges, which " + executor + " cannot do; run the plan"
                        + " without --cluster, or set manual: false (a replay.yaml of a manual arm runs anywhere)");
            }
        }
    }

    /**
     * @param logs the nudge log of each arm (index 0 = arm 1; null for arms without nudges)
     * @return the plan that replays a run: its manual arms become ordinary arms with their nudges fixed
     */
    public static Plan replayPlan(Plan plan, List<NudgeLog> logs) {
        List<ArmPlan> arms = new ArrayList<>();
        for (int i = 0; i < plan.arms().size(); i++) {
            ArmPlan a = plan.arms().get(i);
            if (a.manual()) {
                NudgeLog log = logs.get(i);
                List<NudgeLog.Entry> nudges = log == null ? a.nudges() : List.of(log.entries());
                arms.add(new ArmPlan(a.name(), a.schedule(), a.average(), false, nudges));
            } else {
                arms.add(a);
            }
        }
        String suffix = "-replay";
        String base = plan.study();
        String name = (base.length() + suffix.length() > 100 ? base.substring(0, 100 - suffix.length()) : base) + suffix;
        return new Plan(name, plan.seed(), plan.replicates(), plan.data(), plan.model(), plan.training(),
                plan.baseline(), arms);
    }

    /** Writes {@code replay.yaml} into {@code study} atomically. */
    public static void writeReplay(Path study, Plan plan, List<NudgeLog> logs) throws IOException {
        String text = "# replay of study " + plan.study() + ": its manual arms with the nudges applied so far fixed"
                + " in place;\n# settle run replay.yaml --out DIR reproduces their replicate files exactly\n"
                + PlanWriter.toYaml(replayPlan(plan, logs));
        AtomicFile.write(study.resolve(REPLAY_FILE), text);
    }
}
