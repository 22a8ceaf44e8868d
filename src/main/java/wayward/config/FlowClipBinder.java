package wayward.config;

import wayward.clip.ClipConfig;
import wayward.flow.FlowConfig;

/** Binds [flow] (the flow estimator shared by all cameras) and [clips] (evidence clips); defaults when absent. */
final class FlowClipBinder {
    private FlowClipBinder() {
    }

    static FlowConfig flow(TableReader top) {
        FlowConfig d = FlowConfig.DEFAULTS;
        TableReader s = top.section("flow");
        if (s == null) {
            return d;
        }
        int levels = s.integer("levels", d.levels(), 0, 8);
        int iterations = s.integer("iterations", d.iterations(), 1, 20);
        int finestIterations = s.integer("finest_iterations", d.finestIterations(), 1, 20);
        int window = s.integer("window", d.window(), 3, 15);
        if (window % 2 == 0) {
            s.error("window", window, "an odd number from 3 to 15");
            window = d.window();
        }
        double reg = s.number("regularization", d.regularization(), 0, 1000);
        int stride = s.integer("stride", d.stride(), 1, 16);
        int coarseStride = s.integer("coarse_stride", d.coarseStride(), 1, 32);
        int threads = s.integer("threads", d.threads(), 1, 64);
        boolean skipStill = s.bool("skip_still", d.skipStill());
        s.finish();
        return new FlowConfig(levels, iterations, finestIterations, window, reg, stride, coarseStride, threads,
                skipStill);
    }

    static ClipConfig clips(TableReader top) {
        ClipConfig d = ClipConfig.DEFAULTS;
        TableReader s = top.section("clips");
        if (s == null) {
            return d;
        }
        ClipConfig clips = new ClipConfig(s.bool("enabled", d.enabled()),
                s.number("pre_roll_seconds", d.preRollSeconds(), 0, 60),
                s.number("post_roll_seconds", d.postRollSeconds(), 0, 60),
                s.number("max_seconds", d.maxSeconds(), 5, 3600),
                s.number("keep_days", d.keepDays(), 0.01, 3650),
                s.number("keep_gb", d.keepGigabytes(), 0.01, 100000));
        s.finish();
        return clips;
    }
}
