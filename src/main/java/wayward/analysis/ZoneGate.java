package wayward.analysis;

import java.time.Instant;

/**
 * Whether a zone's rule may raise events now: the operators' mutes and the zone's hours close it. A closed gate
 * drops an event's start and then its end; readings, movers and the live view go on. An event already open when
 * the gate closes ends as usual. Called on the camera's analysis thread for each phase the rule decides.
 */
public interface ZoneGate {
    /** Every zone raises events at every time. */
    ZoneGate OPEN = (camera, zone, now) -> true;

    boolean raises(String camera, String zone, Instant now);
}
