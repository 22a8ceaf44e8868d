package wayward.zone;

import static org.junit.jupiter.api.Assertions.assertEquals;

import org.junit.jupiter.api.Test;

/** The per-track tallies the rule reads to tell a steady body from chance clusters (analytic values). */
class MoversTest {
    private static void put(Movers m, double t, long id, boolean seen, int samples, double travel) {
        m.begin(t, 320, 180, 4);
        m.put(id, seen, t, travel, samples, 40, 12, 12, 160, 90, 0, 4, 4);
        m.end();
    }

    @Test
    void framesSeenFramesSpreadAndDropAreTalliedOverTheTracksLife() {
        Movers m = new Movers(4);
        // seen with 10, 30, 10, 30 samples and missed once: mean 20, standard deviation 10
        int[] samples = {10, 30, 0, 10, 30};
        double[] travel = {0, 3, 6, 2, 5};
        for (int n = 0; n < samples.length; n++) {
            put(m, n * 0.1, 7, samples[n] > 0, samples[n], travel[n]);
        }
        int k = m.slot(7);
        assertEquals(5, m.frames(k));
        assertEquals(4, m.seenFrames(k));
        assertEquals(0.5, m.sampleSpread(k), 1e-12);
        // highest 6 px, then 2 px: fell back 4 px
        assertEquals(4, m.travelDropPx(k), 1e-12);
    }

    @Test
    void aSlotTakenByANewTrackStartsItsTalliesAfresh() {
        Movers m = new Movers(1);
        put(m, 0, 1, true, 50, 10);
        put(m, 0.1, 1, true, 5, 0);
        // a frame without track 1 drops it; track 2 takes the only slot
        m.begin(0.2, 320, 180, 4);
        m.end();
        put(m, 0.3, 2, false, 0, 3);
        int k = m.slot(2);
        assertEquals(1, m.frames(k));
        assertEquals(0, m.seenFrames(k));
        assertEquals(Double.POSITIVE_INFINITY, m.sampleSpread(k));
        assertEquals(0, m.travelDropPx(k), 1e-12);
        put(m, 0.4, 2, true, 8, 4);
        assertEquals(0, m.sampleSpread(k), 1e-12);
    }
}
