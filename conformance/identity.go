package conformance

// Quantity names what an Identity constrains.
type Quantity int

const (
	// EquilibriumR is the position of the minimum, in Å.
	EquilibriumR Quantity = iota
	// MinimumEnergy is V at the minimum, in eV.
	MinimumEnergy
	// DerivativeAtMinimum is V⁽ⁿ⁾(re) in eV/Åⁿ, n given by Identity.Order.
	DerivativeAtMinimum
	// ValueAt is V(r) at r = Identity.R, in eV.
	ValueAt
)

// Identity is a published closed-form value that a potential satisfies: a
// test declaration, checked by the suite (CheckIdentity) and not used by
// any analysis.
type Identity struct {
	Name     string   // e.g. "r_min = 2^(1/6) σ"
	Quantity Quantity // what is constrained
	Order    int      // derivative order for DerivativeAtMinimum
	R        float64  // separation for ValueAt, Å
	Value    float64  // expected value in eV, Å units
	Source   string   // literature reference of the identity
}

// Identifier is implemented by potentials that declare reference
// identities for the suite. It is a declaration about one form: a wrapper
// that changes the potential (a cutoff, a switching function) must not
// forward it, and the suite does not need it to.
type Identifier interface {
	Identities() []Identity
}
