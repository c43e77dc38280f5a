/** The most changes one /board/changes answer holds; a full page means there may be more after its last. */
export const SCHEDULE_CHANGES_PAGE = 500;
