package exact

// DefaultTolerance is how far below the nominal level a method's minimum
// coverage may fall and still count as holding its level in [Recommend]:
// two percentage points.
const DefaultTolerance = 0.02
