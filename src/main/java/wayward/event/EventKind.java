package wayward.event;

/** What an event reports. The JSON names are part of the event record contract. */
public enum EventKind {
    /** Movement against a zone's permitted heading. */
    WRONG_WAY("wrong_way"),
    /** Any movement, for zones without a heading. */
    MOTION("motion"),
    /**
     * The camera stopped delivering pictures (start) and delivers them again (end, same id): the camera is lost,
     * then watching again. Records of earlier versions named the end {@code camera_back}; {@link EventJson#parse}
     * still reads them.
     */
    CAMERA_LOST("camera_lost"),
    /** The view is blocked: the picture lost its large-scale structure (lens covered, sprayed, turned away). */
    VIEW_BLOCKED("view_blocked"),
    /** The picture lost its fine detail while its large-scale structure stayed: out of focus, fogged lens. */
    FOCUS_LOST("focus_lost"),
    /** The stream repeats the very same picture: a frozen encoder or a replayed still. */
    PICTURE_FROZEN("picture_frozen"),
    /** The whole picture shifted and stayed shifted: the camera was knocked or turned. */
    CAMERA_MOVED("camera_moved"),
    /**
     * The camera moved from one instance to another among instances that share one config: its instance went
     * offline, or came back. A start and its end (same id) are sent together; the event names both instances.
     */
    CAMERA_REASSIGNED("camera_reassigned"),
    /** An operator muted a zone (start, with its end time) and it ended: unmuted early, or expired (end). */
    ZONE_MUTED("zone_muted"),
    /** The same for a whole camera: none of its zones raises events meanwhile. */
    CAMERA_MUTED("camera_muted"),
    /** A zone's hours ended, so its rule raises nothing (start), and began again (end). */
    ZONE_OFF_HOURS("zone_off_hours");

    private final String jsonName;

    EventKind(String jsonName) {
        this.jsonName = jsonName;
    }

    public String jsonName() {
        return jsonName;
    }
}
