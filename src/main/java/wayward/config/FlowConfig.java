package wayward.config;

import wayward.flow.FlowSettings;

/**
 * The {@code [flow]} table.
 *
 * @param levels         pyramid levels, 0 = chosen from the analysis size
 * @param iterations     refinement steps per level
 * @param window         side of the square Lucas–Kanade window in pixels (odd)
 * @param regularization pull towards the current estimate, (grey levels per pixel)² per window pixel
 */
public record FlowConfig(int levels, int iterations, int window, double regularization) {
    public static final FlowConfig DEFAULTS = new FlowConfig(0, 3, 5, 1.0);

    public FlowSettings toSettings() {
        return new FlowSettings(levels, iterations, window / 2, (float) regularization, 4, 1);
    }
}
