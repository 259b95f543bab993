package settle.experiments.run;

import java.io.Serializable;

/**
 * One unit of work of a study: replicate {@code replicate} (numbered from 1) of the arm with index {@code arm}
 * (numbered from 1, in plan order after grid expansion). The index is the running plan's only: the arm's files are
 * in its directory named by its id ({@code StudyContext.armId}), whatever its position.
 */
public record ReplicateKey(int arm, int replicate) implements Serializable, Comparable<ReplicateKey> {

    public ReplicateKey {
        if (arm < 1 || replicate < 1) {
            throw new IllegalArgumentException("arm and replicate are numbered from 1: " + arm + ", " + replicate);
        }
    }

    @Override
    public int compareTo(ReplicateKey o) {
        return arm != o.arm ? Integer.compare(arm, o.arm) : Integer.compare(replicate, o.replicate);
    }

    @Override
    public String toString() {
        return "arm " + arm + " replicate " + replicate;
    }
}
