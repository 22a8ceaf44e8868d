package wayward.analysis;

import java.util.List;
import wayward.flow.Quickselect;
import wayward.image.GrayFrame;

/**
 * Tells the analysed frames in which nothing changed around the zones from those in which something may move, so
 * that the flow (most of the analysis) runs only when it can find motion. A site camera sees nothing move for
 * most of its day.
 *
 * <p>The test is cheap: the means of {@value #BLOCK}×{@value #BLOCK} blocks over the zones' bounding box plus
 * {@value #MARGIN_PX} px (a mover is seen in the margin before it enters a zone), compared with the previous
 * analysed frame (what moves at a pixel or more a frame) and with a reference frame up to
 * {@value #REFERENCE_SECONDS} s old (what crawls: its change adds up). Each difference has the median over the
 * blocks taken off (a light switched on, a mains flicker or an exposure step shifts them all). Something changed
 * when a block's change exceeds {@value #NOISE_FACTOR} × the largest change the camera shows in still frames (learned
 * per camera, by each comparison) + {@value #MIN_CHANGE} grey levels. Compressed video is still almost everywhere
 * and noisy only in the blocks the encoder refreshes, so the largest change, not a spread, is the noise that counts.
 * After a change the flow keeps running for {@value #KEEP_SECONDS} s, so the movers' tracks end as they would with
 * the flow on. The first {@value #WARM_UP_SECONDS} s run the flow and learn the noise: the median of their largest
 * changes, so that a mover passing while the camera starts (in fewer than half of those frames) is not taken for
 * noise. A mover can only add change; a mean of the first second learned a faint mover's change as noise, and the
 * gate then skipped the flow while it and the next one like it crossed.
 *
 * <p>One instance per camera and resolution, called by the analysis thread; buffers sized in the constructor,
 * nothing allocated per frame.
 */
final class StillGate {
    /** Side of the blocks whose means are compared, analysis pixels. */
    static final int BLOCK = 4;
    /** Around the zones' bounding box, analysis pixels: a mover is seen before it enters. */
    static final int MARGIN_PX = 16;
    /** Times the learned largest still change from which a block's change counts. */
    static final double NOISE_FACTOR = 2;
    /**
     * Times the learned largest still change up to which (+ {@link #MIN_CHANGE}) a frame judged still teaches the
     * noise. A faint mover's frames fall between this and the change that counts; learning from them taught the
     * gate the mover's change as noise, and it skipped the flow while the mover crossed.
     */
    static final double LEARN_FACTOR = 1.25;
    /** Added to that, grey levels: an encoder's still picture has almost no noise. */
    static final double MIN_CHANGE = 2;
    /**
     * Most the learned still change is trusted with, grey levels: a camera that warmed up on a busy scene learns
     * too much; above this, its gate errs towards running the flow.
     */
    static final double MAX_NOISE = 12;
    /** Age of the reference frame at which it is taken again, seconds. */
    static final double REFERENCE_SECONDS = 1.0;
    /** How long the flow keeps running after the last change, seconds. */
    static final double KEEP_SECONDS = 2.0;
    /** Seconds from the first frame during which the flow always runs and the noise is learned. */
    static final double WARM_UP_SECONDS = 1.0;
    /** Weight of one still frame's largest change in the learned one. */
    private static final double NOISE_RATE = 0.05;
    /** Warm-up frames whose changes are kept for the median: a second at 64 frames a second; later ones are not. */
    private static final int WARM_UP_FRAMES = 64;

    private final int width;
    private final int x0;
    private final int y0;
    private final int columns;
    private final int rows;
    private final float[] current;
    private final float[] previous;
    private final float[] reference;
    private final float[] scratch;
    private final float[] warmPrevious = new float[WARM_UP_FRAMES];
    private final float[] warmReference = new float[WARM_UP_FRAMES];
    private final float[] warmSorted = new float[WARM_UP_FRAMES];
    private boolean primed;
    private double firstSeconds;
    private double referenceSeconds;
    private double changedSeconds;
    private double noisePrevious;
    private double noiseReference;
    private int warmFrames;

    /**
     * A gate for w × h frames over the given zones' polygons (picture fractions; each zone's corners, x and y
     * apart; none: the whole picture). Polygons are read once; the arrays are not kept.
     */
    StillGate(List<double[]> zoneXs, List<double[]> zoneYs, int w, int h) {
        double minX = zoneXs.isEmpty() ? 0 : 1;
        double maxX = zoneXs.isEmpty() ? 1 : 0;
        double minY = minX;
        double maxY = maxX;
        for (int z = 0; z < zoneXs.size(); z++) {
            for (double x : zoneXs.get(z)) {
                minX = Math.min(minX, x);
                maxX = Math.max(maxX, x);
            }
            for (double y : zoneYs.get(z)) {
                minY = Math.min(minY, y);
                maxY = Math.max(maxY, y);
            }
        }
        width = w;
        int left = Math.max(0, (int) Math.floor(minX * w) - MARGIN_PX);
        int right = Math.min(w, (int) Math.ceil(maxX * w) + MARGIN_PX);
        int top = Math.max(0, (int) Math.floor(minY * h) - MARGIN_PX);
        int bottom = Math.min(h, (int) Math.ceil(maxY * h) + MARGIN_PX);
        // whole blocks inside the picture
        columns = Math.min(Math.max(1, (right - left) / BLOCK), Math.max(1, w / BLOCK));
        rows = Math.min(Math.max(1, (bottom - top) / BLOCK), Math.max(1, h / BLOCK));
        x0 = Math.max(0, Math.min(left, w - columns * BLOCK));
        y0 = Math.max(0, Math.min(top, h - rows * BLOCK));
        int n = columns * rows;
        current = new float[n];
        previous = new float[n];
        reference = new float[n];
        scratch = new float[n];
    }

    /**
     * Whether the flow should run for this frame of stream time t: true while warming up, when a block around the
     * zones changed beyond the noise, and for {@link #KEEP_SECONDS} after.
     */
    boolean changed(GrayFrame f, double t) {
        blockMeans(f.pixels);
        final int n = current.length;
        if (!primed) {
            primed = true;
            firstSeconds = t;
            referenceSeconds = t;
            changedSeconds = t;
            warmFrames = 0;
            System.arraycopy(current, 0, previous, 0, n);
            System.arraycopy(current, 0, reference, 0, n);
            return true;
        }
        final double changePrevious = largest(previous);
        final double changeReference = largest(reference);
        final boolean warm = t - firstSeconds < WARM_UP_SECONDS;
        final boolean moved = warm || changePrevious > limit(noisePrevious) || changeReference > limit(noiseReference);
        if (warm) {
            // the median of the first second's largest changes
            if (warmFrames < WARM_UP_FRAMES) {
                warmPrevious[warmFrames] = (float) changePrevious;
                warmReference[warmFrames] = (float) changeReference;
                warmFrames++;
                noisePrevious = median(warmPrevious, warmFrames);
                noiseReference = median(warmReference, warmFrames);
            }
        } else if (!moved) {
            if (changePrevious <= learnLimit(noisePrevious)) {
                noisePrevious += NOISE_RATE * (changePrevious - noisePrevious);
            }
            if (changeReference <= learnLimit(noiseReference)) {
                noiseReference += NOISE_RATE * (changeReference - noiseReference);
            }
        }
        if (moved) {
            changedSeconds = t;
        }
        System.arraycopy(current, 0, previous, 0, n);
        if (t - referenceSeconds >= REFERENCE_SECONDS - 1e-6) {
            System.arraycopy(current, 0, reference, 0, n);
            referenceSeconds = t;
        }
        return t - changedSeconds <= KEEP_SECONDS + 1e-6;
    }

    /** The median of a[0..n) (the upper one of an even count), a left as it is. */
    private float median(float[] a, int n) {
        System.arraycopy(a, 0, warmSorted, 0, n);
        return Quickselect.kth(warmSorted, n, n / 2);
    }

    /** The most change a still frame may show for the noise to learn from it. */
    private static double learnLimit(double noise) {
        return LEARN_FACTOR * noise + MIN_CHANGE;
    }

    /** The change of a block mean that counts, given the learned largest change of still frames. */
    private static double limit(double noise) {
        return NOISE_FACTOR * Math.min(noise, MAX_NOISE) + MIN_CHANGE;
    }

    /** The learned largest change of a block mean between still frames, grey levels (0 before a frame pair). */
    double noise() {
        return noisePrevious;
    }

    /** Starts over (after a gap in the stream): the next frame primes the gate again. */
    void reset() {
        primed = false;
    }

    private void blockMeans(byte[] p) {
        final int w = width;
        final float inv = 1f / (BLOCK * BLOCK);
        for (int r = 0; r < rows; r++) {
            final int top = (y0 + r * BLOCK) * w + x0;
            final int out = r * columns;
            for (int c = 0; c < columns; c++) {
                int sum = 0;
                final int at = top + c * BLOCK;
                for (int dy = 0; dy < BLOCK; dy++) {
                    final int row = at + dy * w;
                    for (int dx = 0; dx < BLOCK; dx++) {
                        sum += p[row + dx] & 0xff;
                    }
                }
                current[out + c] = sum * inv;
            }
        }
    }

    /** Median of current − base over the blocks (the whole picture's brightness step). */
    private float medianStep(float[] base) {
        final int n = current.length;
        for (int i = 0; i < n; i++) {
            scratch[i] = current[i] - base[i];
        }
        return Quickselect.kth(scratch, n, n / 2);
    }

    /** Largest change of a block mean from base, the picture's brightness step taken off. */
    private double largest(float[] base) {
        final float step = medianStep(base);
        float most = 0f;
        for (int i = 0; i < current.length; i++) {
            most = Math.max(most, Math.abs(current[i] - base[i] - step));
        }
        return most;
    }
}
