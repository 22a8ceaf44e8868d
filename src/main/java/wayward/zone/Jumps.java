package wayward.zone;

/**
 * Follows small movers out of the flow's reach by their jumps, for {@link MoverTracker}. A mover crossing tens of
 * pixels between analysed frames reads nonsense flow, so its group turns up far from the prediction made from that
 * flow; here such a group pairs with the track it can have come from, so the track goes on. A run of jumps adds no
 * travel: groups of chance clusters of noise pair as well as a small mover's do (their sample counts scatter alike);
 * a small mover that hops is followed in the picture instead ({@link Hops}).
 */
final class Jumps {
    /**
     * Fastest jump a track follows from centroid to centroid when no group turned up near its prediction,
     * analysis pixels per second: one and a half times a 320-pixel picture's width a second.
     */
    static final double MAX_JUMP_PX_PER_SECOND = 480;

    private final MoverGroups gr;
    private final Tracks tr;
    /** The tracker's pairing: the track of each group (-1: none). */
    private final int[] gTrack;
    private final MoverSettings settings;
    private final float cosGroup;
    private final Nearest near = new Nearest();

    Jumps(MoverGroups groups, Tracks tracks, int[] gTrack, MoverSettings settings) {
        this.gr = groups;
        this.tr = tracks;
        this.gTrack = gTrack;
        this.settings = settings;
        this.cosGroup = (float) Math.cos(Math.toRadians(settings.groupAngleDeg()));
    }

    /**
     * Follows small movers out of the flow's reach by their jumps. A mover crossing tens of pixels between analysed
     * frames reads nonsense flow, so its group turns up far from the prediction made from that flow. Jumps are
     * timed by where the mover was, not when it was seen: a group shows the mover at the earlier frame of its
     * flow ({@link Tracks#placedAt}), and analysed frames picked at 10 a second from 15 are 1/15 and 2/15 s apart
     * in turn, so timing a jump by the later frames would read a steady mover's jumps at twice and half its
     * speed in turn, at the very edges of the run's speed test. Groups no
     * track claimed pair with tracks no group claimed when the track can have jumped there ({@code jumpsTo}), at
     * most {@link #MAX_JUMP_PX_PER_SECOND} × the time between the two places (plus the gate and half the larger box)
     * away, within {@link MoverSettings#lostSeconds}; nearest first. A track already jumping that was paired where
     * its run predicts goes on jumping while its group moves far and its flow cannot follow ({@code jumpGoesOn}).
     */
    void pair(double dt, double t) {
        final int nt = tr.capacity();
        for (int k = 0; k < nt; k++) {
            if (tr.live[k] && tr.group[k] >= 0 && tr.jumps[k] > 0 && jumpGoesOn(k, tr.group[k], dt, t)) {
                tr.jumped[k] = true;
            }
        }
        final double lost = settings.lostSeconds() + 1e-6;
        while (true) {
            near.clear();
            for (int k = 0; k < nt; k++) {
                if (!tr.live[k] || tr.group[k] >= 0 || Double.isNaN(tr.seenAt[k])) {
                    continue;
                }
                if (!(t - tr.seenAt[k] > 0 && t - tr.seenAt[k] <= lost)) {
                    continue;
                }
                // seconds between the places of the two sightings (see Tracks.placedAt)
                final double since = t - dt - tr.placedAt[k];
                for (int g = 0; g < gr.groups; g++) {
                    if (gTrack[g] >= 0) {
                        continue;
                    }
                    final double d = Math.hypot(gr.sumX[g] / gr.count[g] - tr.x[k], gr.sumY[g] / gr.count[g] - tr.y[k]);
                    final double reach = MAX_JUMP_PX_PER_SECOND * since + settings.gatePx()
                            + 0.5 * Math.max(Math.max(tr.w[k], tr.h[k]), gr.side(g));
                    if (d <= reach && d < near.distance && jumpsTo(k, g, since)) {
                        near.offer(d, k, g);
                    }
                }
            }
            if (near.track < 0) {
                break;
            }
            tr.group[near.track] = near.group;
            gTrack[near.group] = near.track;
            tr.jumped[near.track] = true;
        }
        // runs: a first jump starts one from the track's last centroid; a pairing without a jump ends it
        for (int k = 0; k < nt; k++) {
            if (!tr.live[k] || tr.group[k] < 0) {
                continue;
            }
            if (tr.jumped[k] && tr.jumps[k] == 0) {
                tr.jumpX[k] = tr.x[k];
                tr.jumpY[k] = tr.y[k];
                tr.jumpT[k] = tr.placedAt[k];
            }
            tr.jumps[k] = tr.jumped[k] ? tr.jumps[k] + 1 : 0;
        }
    }

    /**
     * True when track k, jumping, jumps again to group g: it can have jumped there ({@code jumpsTo}), and the
     * group's flow reads less than half the run's speed along it.
     */
    private boolean jumpGoesOn(int k, int g, double dt, double t) {
        final double since = t - dt - tr.placedAt[k];
        if (!(since > 0) || !jumpsTo(k, g, since)) {
            return false;
        }
        final double run = t - dt - tr.jumpT[k];
        final double rvx = (gr.sumX[g] / gr.count[g] - tr.jumpX[k]) / run;
        final double rvy = (gr.sumY[g] / gr.count[g] - tr.jumpY[k]) / run;
        final double speed = Math.hypot(rvx, rvy);
        // the flow's reading is px per frame pair of dt seconds
        final double flowAlong = (gr.vu[g] * rvx + gr.vv[g] * rvy) / speed;
        return flowAlong < 0.5 * speed * dt;
    }

    /**
     * True when track k can have jumped to group g in {@code since} seconds: the group has at least
     * {@link MoverTracker#MIN_STEADY_SAMPLES} samples, half to twice the track's peak; the step is at least
     * {@link MoverTracker#FAILED_JUMP_PX} and half the group's larger side (less, and the flow follows it); and a track already
     * jumping goes on its way, within the group angle of its run's direction and, after two jumps, at half to twice
     * its run's speed.
     */
    private boolean jumpsTo(int k, int g, double since) {
        final int n = gr.count[g];
        if (n < MoverTracker.MIN_STEADY_SAMPLES || n < 0.5 * tr.peak[k] || n > 2.0 * tr.peak[k]) {
            return false;
        }
        final double sx = gr.sumX[g] / n - tr.x[k];
        final double sy = gr.sumY[g] / n - tr.y[k];
        final double step = Math.hypot(sx, sy);
        if (step < MoverTracker.FAILED_JUMP_PX || step < 0.5 * gr.side(g)) {
            return false;
        }
        if (tr.jumps[k] == 0) {
            return true;
        }
        final double rx = tr.x[k] - tr.jumpX[k];
        final double ry = tr.y[k] - tr.jumpY[k];
        final double run = Math.hypot(rx, ry);
        final double runSpeed = run / (tr.placedAt[k] - tr.jumpT[k]);
        final double stepSpeed = step / since;
        // one jump's speed scatters (centroids of fragments a fifteenth of a second apart); a longer run's does not
        return run > 0 && rx * sx + ry * sy >= cosGroup * run * step
                && (tr.jumps[k] < 2 || (stepSpeed >= 0.5 * runSpeed && stepSpeed <= 2.0 * runSpeed));
    }
}
