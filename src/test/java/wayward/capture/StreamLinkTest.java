package wayward.capture;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Random;
import org.junit.jupiter.api.Test;

/**
 * The main stream's packets on the analysis stream's time axis, against analytic truth: a simulated camera whose
 * two streams share one clock but start their own timestamps at different moments, delivered with random
 * network delays (a floor plus an exponential tail, common practice for modelling queueing delay) and, in one
 * case, a camera clock that runs slow. The truth of a main packet's analysis time is known exactly from the
 * simulation; the link sees only arrivals and each stream's own timestamps.
 */
class StreamLinkTest {
    private static final double FPS = 15;
    private static final long ORIGIN_NANOS = 5_000_000_000L;

    /** Arrival delay: 4 ms floor plus an exponential tail of mean {@code meanSeconds}. */
    private static double delay(Random r, double meanSeconds) {
        return 0.004 - meanSeconds * Math.log(1 - r.nextDouble());
    }

    private static long nanos(double seconds) {
        return ORIGIN_NANOS + Math.round(seconds * 1e9);
    }

    @Test
    void mapsMainPacketsToTheAnalysisAxisWithinAMillisecondOnceEachStreamHasSeenASecond() {
        Random r = new Random(19);
        StreamLink link = new StreamLink();
        link.analysisOpened();
        link.mainOpened();
        // camera time: the analysis stream's first frame at 0.4 s, the main stream's first packet at 1.0 s
        double analysisStart = 0.4;
        double mainStart = 1.0;
        double worstAfterWarmUp = 0;
        double worstAtFirst = Double.NaN;
        for (int i = 0; i < 60 * FPS; i++) {
            double camera = i / FPS;
            if (camera >= analysisStart) {
                link.analysisFrame(nanos(camera + delay(r, 0.03)), camera - analysisStart);
            }
            if (camera >= mainStart) {
                double mapped = link.mainToAnalysis(nanos(camera + delay(r, 0.05)), camera - mainStart);
                double truth = camera - analysisStart;
                double error = Math.abs(mapped - truth);
                if (Double.isNaN(worstAtFirst)) {
                    worstAtFirst = error;
                }
                if (camera >= mainStart + 1) {
                    worstAfterWarmUp = Math.max(worstAfterWarmUp, error);
                }
            }
        }
        // the first packet alone carries its own delay (mean 50 ms) against the best analysis one
        assertTrue(worstAtFirst < 0.5, "first packet off by " + worstAtFirst + " s");
        // after 15 samples of each, the minimum of each stream's delay is within a few ms of its 4 ms floor
        assertTrue(worstAfterWarmUp < 0.010, "off by " + worstAfterWarmUp + " s after the first second");
    }

    @Test
    void followsACameraClockThatRunsSlowAcrossAnHour() {
        // the camera's clock runs 200 ppm slow against ours (a cheap crystal, from memory: tens to hundreds of ppm),
        // so arrival minus stream time grows; the main stream reconnects 40 minutes after the analysis stream
        // started, so a minimum over all time would hold the analysis offset of 40 minutes ago: 0.48 s wrong (a
        // fast clock would not show it: its offsets shrink, and a plain minimum follows them)
        double ppm = -200e-6;
        Random r = new Random(5);
        StreamLink link = new StreamLink();
        link.analysisOpened();
        double mainStart = 2400;
        boolean mainOpen = false;
        double worst = 0;
        for (int i = 0; i < 3600 * FPS; i++) {
            double ours = i / FPS; // true time on our monotonic clock
            double cameraTime = ours * (1 + ppm); // what the camera stamps
            link.analysisFrame(nanos(ours + delay(r, 0.02)), cameraTime);
            if (ours >= mainStart) {
                if (!mainOpen) {
                    link.mainOpened();
                    mainOpen = true;
                }
                double mainSeconds = cameraTime - mainStart * (1 + ppm);
                double mapped = link.mainToAnalysis(nanos(ours + delay(r, 0.02)), mainSeconds);
                if (ours >= mainStart + 1) {
                    worst = Math.max(worst, Math.abs(mapped - cameraTime));
                }
            }
        }
        // two windows of 10 s at 200 ppm drift by 4 ms; the delays' minima add a few ms more at most
        assertTrue(worst < 0.012, "off by " + worst + " s");
    }

    @Test
    void startsAfreshWhenTheAnalysisStreamReopens() {
        StreamLink link = new StreamLink();
        link.mainOpened();
        assertTrue(Double.isNaN(link.mainToAnalysis(nanos(0), 0)), "no analysis picture yet: no place on its axis");
        link.analysisOpened();
        long pass = link.analysisPass();
        link.analysisFrame(nanos(1.0), 0.0);
        assertEquals(0.0, link.mainToAnalysis(nanos(1.0), 1.0), 1e-6); // arrived with the first picture
        // the analysis stream drops and comes back 30 s later; its stream time was spliced on at 5.0 s
        link.analysisOpened();
        assertEquals(pass + 1, link.analysisPass());
        assertTrue(Double.isNaN(link.mainToAnalysis(nanos(31.0), 31.0)), "offset of the old pass is not used");
        link.analysisFrame(nanos(31.0), 5.0);
        // a main packet arriving with the picture now sits at the picture's spliced time
        assertEquals(5.0, link.mainToAnalysis(nanos(31.0), 31.0), 1e-6);
    }
}
