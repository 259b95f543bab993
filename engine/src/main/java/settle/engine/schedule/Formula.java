package settle.engine.schedule;

import settle.engine.text.NearMiss;
import java.util.List;
import java.util.Map;
import java.util.Objects;
import net.objecthunter.exp4j.Expression;
import net.objecthunter.exp4j.ExpressionBuilder;
import net.objecthunter.exp4j.ValidationResult;
import net.objecthunter.exp4j.tokenizer.UnknownFunctionOrVariableException;
import settle.input.BadInputException;

/**
 * {@code formula}: α = expr, an expression (exp4j 0.4.8 syntax: + − * / ^ %, and the functions abs, ceil,
 * floor, exp, expm1, log, log1p, log2, log10, sqrt, cbrt, sin, cos, tan, their inverses and hyperbolic forms,
 * signum) of the counters {@code epoch} (from 1),
 * {@code update} (from 1), {@code progress} = (update − 1) / total_updates, {@code updates_per_epoch} and
 * {@code total_updates}. Note exp4j's precedence: {@code -2^2} = −4 and {@code 2^3^2} = 512. An unknown
 * variable or function is an error at parse; a result that is negative or not finite is an error when the
 * rate is evaluated, naming the counters.
 */
public final class Formula implements Schedule {

    /** The kind name. */
    public static final String KIND = "formula";

    /** The variables an expression may read. */
    public static final List<String> VARIABLES =
            List.of("epoch", "update", "progress", "updates_per_epoch", "total_updates");

    private final String expr;
    private final Warmup warmup;
    private final Expression compiled;

    /**
     * @param expr the expression
     * @param warmup the warmup, or {@link Warmup#NONE}
     * @throws BadInputException for an empty or malformed expression, or an unknown variable or function
     */
    public Formula(String expr, Warmup warmup) {
        this.expr = Check.present(KIND, "expr", expr);
        this.warmup = Check.present(KIND, "warmup", warmup);
        this.compiled = compile(expr);
    }

    private static Expression compile(String expr) {
        if (expr.isBlank()) {
            throw Check.bad(KIND, "expr", "''", "an expression of " + String.join(", ", VARIABLES));
        }
        Expression e;
        try {
            e = new ExpressionBuilder(expr).implicitMultiplication(false)
                    .variables(VARIABLES.toArray(new String[0])).build();
        } catch (UnknownFunctionOrVariableException u) {
            String token = identifierAt(expr, u.getPosition(), u.getToken());
            String hint = NearMiss.closest(token, VARIABLES);
            throw BadInputException.of("expr", KIND + ": expr = " + BadInputException.shown(expr) + " uses the unknown variable or function "
                    + BadInputException.shown(token) + (hint == null ? "" : "; did you mean '" + hint + "'?")
                    + (hint == null ? "; expected variables " + String.join(", ", VARIABLES) : ""));
        } catch (IllegalArgumentException | java.util.EmptyStackException x) {
            throw Check.bad(KIND, "expr", BadInputException.shown(expr), "a well-formed expression (" + x.getMessage() + ")");
        }
        ValidationResult v = e.validate(false);
        if (!v.isValid()) {
            throw Check.bad(KIND, "expr", BadInputException.shown(expr), "a well-formed expression (" + String.join("; ", v.getErrors()) + ")");
        }
        return e;
    }

    /**
     * exp4j reports the unknown rest of a name after a known prefix ("pok" in "epok", after the constant e):
     * widen it to the whole identifier around the reported position.
     */
    private static String identifierAt(String expr, int position, String token) {
        if (position < 0 || position >= expr.length()) {
            return token;
        }
        int start = position;
        while (start > 0 && isNamePart(expr.charAt(start - 1))) {
            start--;
        }
        int end = position;
        while (end < expr.length() && isNamePart(expr.charAt(end))) {
            end++;
        }
        return end > start ? expr.substring(start, end) : token;
    }

    private static boolean isNamePart(char c) {
        return Character.isLetterOrDigit(c) || c == '_';
    }

    static Formula parse(KeyReader r) {
        r.allow("expr", "warmup");
        return new Formula(r.string("expr"), Warmup.parse(r));
    }

    /** @return the expression as written */
    public String expr() {
        return expr;
    }

    @Override
    public Warmup warmup() {
        return warmup;
    }

    @Override
    public String kind() {
        return KIND;
    }

    @Override
    public RateDriver start(RunShape shape) {
        return new Driver(new Expression(compiled), expr, shape, warmup.updatesFor(shape, KIND));
    }

    @Override
    public Asymptotics asymptotics() {
        return Asymptotics.EXPRESSION;
    }

    @Override
    public String describe() {
        return KIND + ": α = " + expr + " (epoch, update from 1; progress = (update − 1)/total_updates)"
                + warmup.describe();
    }

    @Override
    public Map<String, Object> resolved() {
        return new Resolved(KIND).put("expr", expr).end(warmup);
    }

    @Override
    public boolean equals(Object o) {
        return o instanceof Formula f && f.expr.equals(expr) && f.warmup.equals(warmup);
    }

    @Override
    public int hashCode() {
        return Objects.hash(expr, warmup);
    }

    @Override
    public String toString() {
        return "Formula[expr=" + expr + ", warmup=" + warmup + "]";
    }

    /**
     * Evaluates the expression per update. Its own copy of the compiled expression (exp4j expressions hold
     * their variable values), so drivers of different replicates may run on different threads. exp4j
     * allocates a small stack per evaluation: the one kind whose rate is not allocation-free.
     */
    static final class Driver implements RateDriver {

        private final Expression e;
        private final String expr;
        private final RunShape shape;
        private final long warmupUpdates;

        Driver(Expression e, String expr, RunShape shape, long warmupUpdates) {
            this.e = e;
            this.expr = expr;
            this.shape = shape;
            this.warmupUpdates = warmupUpdates;
            e.setVariable("updates_per_epoch", shape.updatesPerEpoch());
            e.setVariable("total_updates", shape.totalUpdates());
        }

        @Override
        public double rate(int epoch, long update) {
            e.setVariable("epoch", epoch);
            e.setVariable("update", update);
            e.setVariable("progress", shape.progress(update));
            double a;
            try {
                a = e.evaluate();
            } catch (ArithmeticException x) {
                throw BadInputException.of("expr", KIND + ": expr = " + BadInputException.shown(expr) + " fails at epoch " + epoch
                        + ", update " + update + " (" + x.getMessage() + "); expected a finite rate ≥ 0");
            }
            if (!(a >= 0) || !Double.isFinite(a)) {
                throw BadInputException.of("expr", KIND + ": expr = " + BadInputException.shown(expr) + " gives " + Fmt.num(a) + " at epoch "
                        + epoch + ", update " + update + "; expected a finite rate ≥ 0");
            }
            return a * Warmup.factor(update, warmupUpdates);
        }
    }
}
