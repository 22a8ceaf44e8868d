package wayward.flow;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.SplittableRandom;
import java.util.TreeMap;
import java.util.function.Predicate;
import java.util.function.UnaryOperator;
import org.bytedeco.opencv.global.opencv_core;
import org.bytedeco.opencv.opencv_core.Mat;
import org.bytedeco.opencv.opencv_video.DISOpticalFlow;

/**
 * Object-motion benchmark: one object moving over a still background ({@link ObjectMotionCase}), scored on the
 * dense per-pixel flow. Whole-picture suites ({@link OpenCvReferenceTest}, {@link FlowCurve}) cannot see how much
 * of a small mover an estimator keeps; this one measures exactly that.
 *
 * <p>Cases, per half: object sizes {@link #SIZES_PX} × texture kinds (photo patch, procedural, plain, plain with
 * a darker rim) × motions {@link #MOTIONS_PX} × backgrounds (photo, plain grey) × sensor noise (none, σ
 * {@link #NOISE_SIGMA}) = 480 cases, each with its own direction (uniform over 0–360°) and position. The two
 * halves ({@link Half}) use different background photographs, different object photographs and different seeds
 * (even for tune, odd for held-out), so defaults can be chosen on "tune" and reported on "held-out".
 *
 * <p>Scores per case, on the dense flow (a field with a stride above 1 goes through {@link #BILINEAR}, i.e.
 * {@link FlowField#toDense()}, unless the caller passes another densifier):
 * <ul>
 *   <li><b>caught</b>: share of the object's pixels (first frame) whose flow f is caught, for truth t: caught iff
 *   |f − t| ≤ min(1 px, |t|/2) <i>or</i> (|f| ≥ |t|/2 and the angle between f and t ≤ 30°). This is the issue's
 *   "within 1 px or 30° of the truth", with the 1-px term capped at half the true length so that a zero flow
 *   never catches a motion of 1 px or less, and the angle term counted only for flows of at least half the true
 *   length. (Either way the EPE term is contained in the angle term, so in effect: direction within 30° and at
 *   least half the length.)</li>
 *   <li><b>object EPE</b>: mean endpoint error |f − t| over the object's pixels, px.</li>
 *   <li><b>ring EPE</b>: mean |f| over the ring of still background around the object (within 7 px of the
 *   first frame's object, 7K px at scale K, touched by the object in neither frame), px.</li>
 * </ul>
 * Aggregates are plain means over cases (each case weighs the same, whatever the object's size).
 *
 * <p>Run by hand (DEVELOPERS.md, "Benchmarks"); prints Markdown tables (about 40 s for all 960 cases):
 * {@code java -cp target/classes:target/test-classes:$(cat target/cp.txt) wayward.flow.ObjectMotionBench
 * [--fast | --every=N] [--csv=FILE]} ({@code -Dbench.noise=S} for another noise, {@code -Dbench.scale=K} for the
 * same scenes at K times the resolution, see {@link ObjectMotionCase#SCALE}, and {@code -Dbench.movers=M} for
 * movers at M times their sizes and motions, {@link ObjectMotionCase#MOVER_SCALE}, and {@code -Dbench.shrink=K} for
 * the scenes seen at 1/K the resolution, {@link ObjectMotionCase#SHRINK}), the classpath from {@code mvn -B -q dependency:build-classpath
 * -Dmdep.outputFile=target/cp.txt -Dmdep.includeScope=test}. {@code --fast} scores every {@value #FAST_EVERY}th
 * case of each half (about 5 s). Methods run on one thread.
 *
 * <p>From code (while changing the estimator): {@code score(settings, fastCases(Half.TUNE)).mean()} or
 * {@code .by(Group.SIZE)} scores any settings of wayward's estimator ({@link #score(FlowSettings, List)});
 * {@link #score(FlowEstimator, List)} an estimator built by the caller; {@link #score(Method, List, UnaryOperator)}
 * any method with any densification. Not thread-safe; allocates freely (test code).
 */
public final class ObjectMotionBench {
    /** Object sides, pixels. */
    static final int[] SIZES_PX = {8, 12, 20, 32, 48};
    /** Displacement lengths, pixels per frame pair. */
    static final double[] MOTIONS_PX = {0.5, 1, 2, 4, 6, 8};
    /** Sensor noise of the noisy cases, grey levels (independent per frame); {@code -Dbench.noise=S} for another. */
    static final double NOISE_SIGMA = Double.parseDouble(System.getProperty("bench.noise", "2.5"));
    /** Caught rule (see the class comment): endpoint error, angle and the shortest length, as share of |t|. */
    static final double CAUGHT_EPE_PX = 1;
    static final double CAUGHT_ANGLE_DEG = 30;
    static final double CAUGHT_MIN_LENGTH_SHARE = 0.5;
    /** {@code --fast}: every 7th case (7 is prime to every loop length of the enumeration, so all levels stay). */
    static final int FAST_EVERY = 7;
    /** The densification of sampled fields used unless another is passed: bilinear between samples. */
    static final UnaryOperator<FlowField> BILINEAR = FlowField::toDense;

    private static final int W = ObjectMotionCase.WIDTH / ObjectMotionCase.SHRINK;
    private static final int H = ObjectMotionCase.HEIGHT / ObjectMotionCase.SHRINK;
    private static final double COS_CAUGHT = Math.cos(Math.toRadians(CAUGHT_ANGLE_DEG));

    private ObjectMotionBench() {
    }

    /**
     * The two halves of the benchmark. Photographs from Debian's opencv-doc package; no photograph serves in
     * both halves or as both a background and an object.
     */
    enum Half {
        TUNE("tune", 0, List.of("building.jpg", "fruits.jpg", "home.jpg", "graf1.png"),
                List.of("butterfly.jpg", "smarties.png", "messi5.jpg", "stuff.jpg")),
        HELD_OUT("held-out", 1, List.of("baboon.jpg", "aero1.jpg", "left01.jpg", "leuvenA.jpg"),
                List.of("squirrel_cls.jpg", "board.jpg", "HappyFish.jpg", "box_in_scene.png"));

        final String label;
        final int seedParity;
        final List<String> backgrounds;
        final List<String> objects;

        Half(String label, int seedParity, List<String> backgrounds, List<String> objects) {
            this.label = label;
            this.seedParity = seedParity;
            this.backgrounds = backgrounds;
            this.objects = objects;
        }
    }

    /** A flow method under test. {@link #flow} is called from one thread; the field returned may be reused. */
    interface Method extends AutoCloseable {
        String name();

        /** Flow from {@code first} to {@code second} ({@link ObjectMotionCase#WIDTH} × HEIGHT gray 8-bit). */
        FlowField flow(byte[] first, byte[] second);

        @Override
        default void close() {
        }
    }

    /** Scores of one case or means over cases: caught share (0 to 1), object and ring EPE (px). */
    record Score(double caught, double objectEpe, double ringEpe) {
    }

    /** One case's scores and the wall time of the method's call, milliseconds. */
    record CaseScore(ObjectMotionCase testCase, Score score, double millis) {
    }

    /** A grouping of cases for breakdowns. */
    enum Group {
        SIZE("size"), TEXTURE("texture"), MOTION("motion"), BACKGROUND("background"), NOISE("noise");

        final String label;

        Group(String label) {
            this.label = label;
        }

        String key(ObjectMotionCase c) {
            switch (this) {
                case SIZE:
                    return c.sizePx() + " px";
                case TEXTURE:
                    return c.texture().label;
                case MOTION:
                    return String.format(Locale.ROOT, "%s px", trim(c.motionPx()));
                case BACKGROUND:
                    return c.background().label;
                case NOISE:
                    return c.noiseSigma() > 0 ? "σ " + trim(c.noiseSigma()) : "none";
                default:
                    throw new IllegalStateException("group: " + this);
            }
        }

        /** Sort key of the case's level. */
        double order(ObjectMotionCase c) {
            switch (this) {
                case SIZE:
                    return c.sizePx();
                case TEXTURE:
                    return c.texture().ordinal();
                case MOTION:
                    return c.motionPx();
                case BACKGROUND:
                    return c.background().ordinal();
                case NOISE:
                    return c.noiseSigma();
                default:
                    throw new IllegalStateException("group: " + this);
            }
        }
    }

    /** A method's scores over a list of cases, in case order. */
    record Result(String method, List<CaseScore> cases) {
        Score mean() {
            return meanOf(cases);
        }

        /** Mean wall time of the method's calls, milliseconds (indicative: shared machine). */
        double meanMillis() {
            return cases.stream().mapToDouble(CaseScore::millis).average().orElse(Double.NaN);
        }

        /** Means per level of a group, levels in ascending order (sizes, motions) or declaration order. */
        Map<String, Score> by(Group g) {
            Map<Double, List<CaseScore>> parts = new TreeMap<>();
            Map<Double, String> labels = new TreeMap<>();
            for (CaseScore c : cases) {
                double order = g.order(c.testCase());
                parts.computeIfAbsent(order, k -> new ArrayList<>()).add(c);
                labels.put(order, g.key(c.testCase()));
            }
            Map<String, Score> out = new LinkedHashMap<>();
            parts.forEach((k, v) -> out.put(labels.get(k), meanOf(v)));
            return out;
        }
    }

    /** The cases of {@code --fast}: every {@value #FAST_EVERY}th case of a half (69 of 480). */
    static List<ObjectMotionCase> fastCases(Half half) {
        return cases(half, FAST_EVERY);
    }

    /** Every case of a half, in enumeration order (size, texture, motion, background, noise: innermost last). */
    static List<ObjectMotionCase> cases(Half half) {
        return cases(half, 1);
    }

    /** Every {@code every}th case of a half (the first included); {@code every} must be prime to 2, 3 and 5. */
    static List<ObjectMotionCase> cases(Half half, int every) {
        if (every < 1 || (every % 2 == 0 && every > 1) || every % 3 == 0 || every % 5 == 0) {
            throw new IllegalArgumentException("every: " + every
                    + " (expected 1 or a number prime to 2, 3 and 5, so that every level of every factor stays)");
        }
        List<ObjectMotionCase> all = new ArrayList<>();
        int photoBackgrounds = 0;
        int photoObjects = 0;
        int index = 0;
        for (int size : SIZES_PX) {
            for (ObjectMotionCase.TextureKind texture : ObjectMotionCase.TextureKind.values()) {
                for (double motion : MOTIONS_PX) {
                    for (ObjectMotionCase.BackgroundKind bg : ObjectMotionCase.BackgroundKind.values()) {
                        for (double noise : new double[] {0, NOISE_SIGMA}) {
                            String bgPhoto = null;
                            if (bg == ObjectMotionCase.BackgroundKind.PHOTO) {
                                bgPhoto = half.backgrounds.get(balanced(photoBackgrounds++, half.backgrounds.size()));
                            }
                            String objPhoto = null;
                            if (texture == ObjectMotionCase.TextureKind.PHOTO) {
                                objPhoto = half.objects.get(balanced(photoObjects++, half.objects.size()));
                            }
                            // alternating seeds: even in the tune half, odd in the held-out half
                            long seed = 2L * index + half.seedParity;
                            double angle = 360 * new SplittableRandom(~seed).nextDouble();
                            if (index % every == 0) {
                                all.add(new ObjectMotionCase(half, index, bg, bgPhoto, size, texture, objPhoto, motion,
                                        angle, noise, seed).scaled(ObjectMotionCase.MOVER_SCALE));
                            }
                            index++;
                        }
                    }
                }
            }
        }
        return all;
    }

    /**
     * Cycles through n items, moving on by one more after each full cycle, so no item always meets the same
     * level of the inner loops (noise, background).
     */
    private static int balanced(int count, int n) {
        return (count + count / n) % n;
    }

    // ---------------------------------------------------------------------------------------------- scoring

    /** Scores wayward's estimator with the given settings (a fresh estimator, closed afterwards). */
    static Result score(FlowSettings settings, List<ObjectMotionCase> cases) {
        try (Method m = wayward("wayward", settings)) {
            return score(m, cases, BILINEAR);
        }
    }

    /** Scores an estimator made by the caller for {@link ObjectMotionCase#WIDTH} × HEIGHT (the caller closes it). */
    static Result score(FlowEstimator estimator, List<ObjectMotionCase> cases) {
        return score(of("estimator", estimator), cases, BILINEAR);
    }

    /** Scores any method, with the given densification of sampled fields. */
    static Result score(Method method, List<ObjectMotionCase> cases, UnaryOperator<FlowField> densify) {
        return scoreAll(List.of(method), cases, densify).get(0);
    }

    /** Scores several methods on the same rendered frames (each case is rendered once). */
    static List<Result> scoreAll(List<Method> methods, List<ObjectMotionCase> cases, UnaryOperator<FlowField> densify) {
        List<List<CaseScore>> per = new ArrayList<>();
        for (int m = 0; m < methods.size(); m++) {
            per.add(new ArrayList<>(cases.size()));
        }
        for (ObjectMotionCase c : cases) {
            ObjectMotionCase.Frames f = c.render().shrunk(ObjectMotionCase.SHRINK);
            for (int m = 0; m < methods.size(); m++) {
                long t0 = System.nanoTime();
                FlowField flow = methods.get(m).flow(f.first(), f.second());
                double millis = (System.nanoTime() - t0) / 1e6;
                per.get(m).add(new CaseScore(c, score(flow, f, densify), millis));
            }
        }
        List<Result> out = new ArrayList<>();
        for (int m = 0; m < methods.size(); m++) {
            out.add(new Result(methods.get(m).name(), per.get(m)));
        }
        return out;
    }

    /**
     * Scores one flow field against a rendered case. The only place where a sampled field is made dense: through
     * {@code densify} when its stride is above 1.
     */
    static Score score(FlowField flow, ObjectMotionCase.Frames f, UnaryOperator<FlowField> densify) {
        FlowField d = flow.stride > 1 ? densify.apply(flow) : flow;
        if (d.stride != 1 || d.width != W || d.height != H) {
            throw new IllegalArgumentException("flow: " + d.width + "x" + d.height + " every " + d.stride
                    + " px (expected a dense " + W + "x" + H + " field)");
        }
        double tx = f.dx();
        double ty = f.dy();
        double objectSum = 0;
        int caught = 0;
        int objectCount = 0;
        double ringSum = 0;
        int ringCount = 0;
        for (int i = 0; i < W * H; i++) {
            if (f.object()[i]) {
                objectSum += Math.hypot(d.u[i] - tx, d.v[i] - ty);
                if (caught(d.u[i], d.v[i], tx, ty)) {
                    caught++;
                }
                objectCount++;
            } else if (f.ring()[i]) {
                ringSum += Math.hypot(d.u[i], d.v[i]);
                ringCount++;
            }
        }
        return new Score((double) caught / objectCount, objectSum / objectCount, ringSum / ringCount);
    }

    /** The caught rule of the class comment for flow (u, v) and truth (tx, ty), pixels. */
    static boolean caught(double u, double v, double tx, double ty) {
        double truth = Math.hypot(tx, ty);
        double length = Math.hypot(u, v);
        double epe = Math.hypot(u - tx, v - ty);
        if (epe <= Math.min(CAUGHT_EPE_PX, CAUGHT_MIN_LENGTH_SHARE * truth)) {
            return true;
        }
        return length >= CAUGHT_MIN_LENGTH_SHARE * truth && length > 0
                && (u * tx + v * ty) >= COS_CAUGHT * length * truth;
    }

    private static Score meanOf(List<CaseScore> cases) {
        double c = 0;
        double o = 0;
        double r = 0;
        for (CaseScore s : cases) {
            c += s.score().caught();
            o += s.score().objectEpe();
            r += s.score().ringEpe();
        }
        int n = cases.size();
        return new Score(c / n, o / n, r / n);
    }

    // ---------------------------------------------------------------------------------------------- methods

    /**
     * wayward's estimator for the given settings ({@link FlowEstimator#create}) through
     * {@link FlowEstimator#computeDense}, the dense output the {@code flow} command writes; closing closes it.
     */
    static Method wayward(String name, FlowSettings settings) {
        FlowEstimator e = FlowEstimator.create(W, H, settings);
        return new Method() {
            @Override
            public String name() {
                return name;
            }

            @Override
            public FlowField flow(byte[] first, byte[] second) {
                return e.computeDense(first, second);
            }

            @Override
            public void close() {
                e.close();
            }
        };
    }

    /** An estimator owned by the caller; its field is reused between calls. */
    static Method of(String name, FlowEstimator estimator) {
        FlowField out = estimator.newField();
        return new Method() {
            @Override
            public String name() {
                return name;
            }

            @Override
            public FlowField flow(byte[] first, byte[] second) {
                estimator.compute(first, second, out);
                return out;
            }
        };
    }

    /**
     * OpenCV DIS (Kroeger et al. 2016) through JavaCV with one of its presets. The output flow is a new Mat for
     * every call: DIS starts from the flow it is given, and would otherwise reuse the previous case's result
     * (FLOW-NOTES, "DIS keeps state").
     */
    static Method dis(String name, int preset) {
        opencv_core.setNumThreads(1);
        DISOpticalFlow dis = DISOpticalFlow.create(preset);
        return new Method() {
            @Override
            public String name() {
                return name;
            }

            @Override
            public FlowField flow(byte[] first, byte[] second) {
                try (Mat a = OpenCvFlow.gray(first, W, H); Mat b = OpenCvFlow.gray(second, W, H); Mat flow = new Mat()) {
                    dis.calc(a, b, flow);
                    return OpenCvFlow.toField(flow, W, H);
                }
            }

            @Override
            public void close() {
                dis.close();
            }
        };
    }

    /** OpenCV Farnebäck (2003) with the parameters of OpenCvFlow and FLOW-NOTES (0.5, 3, 15, 3, 5, 1.2). */
    static Method farneback() {
        opencv_core.setNumThreads(1);
        return new Method() {
            @Override
            public String name() {
                return "OpenCV Farneback";
            }

            @Override
            public FlowField flow(byte[] first, byte[] second) {
                return OpenCvFlow.farneback(first, second, W, H);
            }
        };
    }

    /** Zero flow everywhere: the floor every method must beat (caught 0, object EPE = |t|, ring EPE 0). */
    static Method zero() {
        FlowField none = new FlowField(W, H);
        return new Method() {
            @Override
            public String name() {
                return "zero flow (floor)";
            }

            @Override
            public FlowField flow(byte[] first, byte[] second) {
                return none;
            }
        };
    }

    /** The methods compared by {@link #main}, in table order; the caller closes them. */
    static List<Method> standardMethods() {
        return List.of(
                wayward("wayward grid LK (defaults)", FlowSettings.defaults()),
                dis("OpenCV DIS ULTRAFAST", DISOpticalFlow.PRESET_ULTRAFAST),
                dis("OpenCV DIS FAST", DISOpticalFlow.PRESET_FAST),
                dis("OpenCV DIS MEDIUM", DISOpticalFlow.PRESET_MEDIUM),
                farneback(),
                zero());
    }

    // ---------------------------------------------------------------------------------------------- report

    /**
     * Prints the tables on stdout. Arguments: {@code --fast} (every {@value #FAST_EVERY}th case) or
     * {@code --every=N}; {@code --csv=FILE} also writes every case's scores for every method, one line each.
     */
    public static void main(String[] args) throws IOException {
        int every = 1;
        Path csv = null;
        for (String a : args) {
            if (a.equals("--fast")) {
                every = FAST_EVERY;
            } else if (a.startsWith("--every=")) {
                every = Integer.parseInt(a.substring("--every=".length()));
            } else if (a.startsWith("--csv=")) {
                csv = Path.of(a.substring("--csv=".length()));
            } else {
                throw new IllegalArgumentException("argument: " + a + " (expected --fast, --every=N or --csv=FILE)");
            }
        }
        opencv_core.setNumThreads(1);
        long t0 = System.nanoTime();
        Map<Half, List<Result>> results = new LinkedHashMap<>();
        int caseCount = 0;
        for (Half half : Half.values()) {
            List<ObjectMotionCase> cases = cases(half, every);
            caseCount += cases.size();
            List<Method> methods = standardMethods();
            try {
                results.put(half, scoreAll(methods, cases, BILINEAR));
            } finally {
                methods.forEach(Method::close);
            }
        }
        double seconds = (System.nanoTime() - t0) / 1e9;
        System.out.print(report(results, every));
        System.out.printf(Locale.ROOT, "%n%d cases at %d×%d (scale %d, movers' scale %d, shrink %d, noisy cases σ %s before it) in %.0f s.%n",
                caseCount, W, H, ObjectMotionCase.SCALE, ObjectMotionCase.MOVER_SCALE, ObjectMotionCase.SHRINK,
                trim(NOISE_SIGMA), seconds);
        if (csv != null) {
            Files.writeString(csv, csv(results));
        }
    }

    /** Every case's scores, one line per method and case, with the case's factors. */
    static String csv(Map<Half, List<Result>> results) {
        StringBuilder sb = new StringBuilder("method,half,index,background,background_photo,size_px,texture,"
                + "texture_photo,motion_px,angle_deg,noise_sigma,seed,caught,object_epe_px,ring_epe_px,millis\n");
        results.values().forEach(list -> list.forEach(r -> r.cases().forEach(c -> {
            ObjectMotionCase k = c.testCase();
            sb.append(String.format(Locale.ROOT, "%s,%s,%d,%s,%s,%d,%s,%s,%s,%.1f,%s,%d,%.4f,%.4f,%.4f,%.2f%n",
                    r.method(), k.half().label, k.index(), k.background().label,
                    k.backgroundPhoto() == null ? "" : k.backgroundPhoto(), k.sizePx(), k.texture().label,
                    k.texturePhoto() == null ? "" : k.texturePhoto(), trim(k.motionPx()), k.angleDeg(),
                    trim(k.noiseSigma()), k.seed(), c.score().caught(), c.score().objectEpe(), c.score().ringEpe(),
                    c.millis()));
        })));
        return sb.toString();
    }

    static String report(Map<Half, List<Result>> results, int every) {
        StringBuilder sb = new StringBuilder();
        List<Result> tune = results.get(Half.TUNE);
        List<Result> held = results.get(Half.HELD_OUT);
        sb.append(String.format(Locale.ROOT, "### Object motion at %dx%d, %s%n%n", W, H,
                every == 1 ? "all cases" : "every " + every + "th case"));
        sb.append(String.format(Locale.ROOT, "Caught: share of the object's pixels whose flow f has |f - t| <= "
                + "min(1 px, |t|/2) or (|f| >= |t|/2 and angle(f, t) <= 30 deg). EPE in px, object = first-frame "
                + "object pixels, ring = still background within %s px of it that the object touches in neither frame. "
                + "Means over %d (tune) and %d (held-out) cases; ms = mean wall time per pair, one thread, shared "
                + "machine (indicative).%n%n", trim(ObjectMotionCase.RING_PX), tune.get(0).cases().size(),
                held.get(0).cases().size()));
        sb.append("| method | tune caught | tune object EPE | tune ring EPE | held-out caught | held-out object EPE "
                + "| held-out ring EPE | ms |\n");
        sb.append("|---|---|---|---|---|---|---|---|\n");
        for (int m = 0; m < tune.size(); m++) {
            Score a = tune.get(m).mean();
            Score b = held.get(m).mean();
            double ms = (tune.get(m).meanMillis() + held.get(m).meanMillis()) / 2;
            sb.append(String.format(Locale.ROOT, "| %s | %.2f | %.2f | %.2f | %.2f | %.2f | %.2f | %.1f |%n",
                    tune.get(m).method(), a.caught(), a.objectEpe(), a.ringEpe(), b.caught(), b.objectEpe(),
                    b.ringEpe(), ms));
        }
        for (Group g : Group.values()) {
            sb.append(breakdown(tune, g));
        }
        // on grey the ring is featureless (any flow there is a guess), so the photo backgrounds show the
        // interplay of motion, size and a textured still surround on their own
        Predicate<ObjectMotionCase> photo = c -> c.background() == ObjectMotionCase.BackgroundKind.PHOTO;
        sb.append(breakdown(tune, Group.MOTION, photo, "Tune half, photo backgrounds only, by motion"));
        sb.append(breakdown(tune, Group.SIZE, photo, "Tune half, photo backgrounds only, by size"));
        return sb.toString();
    }

    /** A table of one half's results per level of a group; cells "caught / object EPE / ring EPE". */
    static String breakdown(List<Result> results, Group g) {
        return breakdown(results, g, c -> true, "Tune half by " + g.label);
    }

    /** The same over the cases that pass {@code filter}. */
    static String breakdown(List<Result> results, Group g, Predicate<ObjectMotionCase> filter, String title) {
        List<Result> kept = new ArrayList<>();
        for (Result r : results) {
            List<CaseScore> some = new ArrayList<>();
            for (CaseScore c : r.cases()) {
                if (filter.test(c.testCase())) {
                    some.add(c);
                }
            }
            kept.add(new Result(r.method(), some));
        }
        StringBuilder sb = new StringBuilder();
        Map<String, Score> first = kept.get(0).by(g);
        sb.append(String.format(Locale.ROOT, "%n#### %s (caught / object EPE / ring EPE)%n%n", title));
        sb.append("| method |");
        first.keySet().forEach(k -> sb.append(' ').append(k).append(" |"));
        sb.append('\n').append("|---|");
        first.keySet().forEach(k -> sb.append("---|"));
        sb.append('\n');
        for (Result r : kept) {
            sb.append("| ").append(r.method()).append(" |");
            for (Score s : r.by(g).values()) {
                sb.append(String.format(Locale.ROOT, " %.2f / %.2f / %.2f |", s.caught(), s.objectEpe(), s.ringEpe()));
            }
            sb.append('\n');
        }
        return sb.toString();
    }

    private static String trim(double v) {
        return v == Math.rint(v) ? Long.toString((long) v) : Double.toString(v);
    }
}
