package settle.engine.theory;

/** What the objective is near θ*, which decides how exact the linear recursion is. */
public enum ObjectiveKind {
    /** A quadratic with state-independent gradient noise: the recursion is exact. */
    QUADRATIC,
    /** Logistic regression (binary or multinomial): per-example curvatures differ, first order. */
    LOGISTIC
}
