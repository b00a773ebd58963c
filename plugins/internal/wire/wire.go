// Package wire holds what the pairwell plugin host and the author SDK share:
// the go-plugin handshake, the go-plugin glue, the conversions between core
// types and their protobuf messages, and the server side of the protocol.
package wire

import (
	"context"
	"errors"
	"fmt"
	"math"
	"strings"

	plugin "github.com/hashicorp/go-plugin"
	"google.golang.org/grpc"

	"github.com/pairwell/pairwell/conformance"
	"github.com/pairwell/pairwell/core"
	"github.com/pairwell/pairwell/core/units"
	pb "github.com/pairwell/pairwell/plugins/proto"
)

// The go-plugin handshake. The cookie is not a security measure: it only
// tells a plugin that pairwell started it.
const (
	MagicCookieKey   = "PAIRWELL_PLUGIN"
	MagicCookieValue = "pairwell-forms-7f3c9a1e5b2d4c68"
	// ProtocolVersion is the version of the plugin protocol this build
	// speaks: 2, evaluation by Taylor coefficients (version 1 evaluated
	// one derivative order per call and is refused).
	ProtocolVersion = 2
	// PluginName is the name of the one go-plugin plugin a pairwell plugin
	// serves: the Forms service.
	PluginName = "forms"
)

// Handshake returns the handshake for the given application protocol
// version; pairwell speaks ProtocolVersion.
func Handshake(version uint) plugin.HandshakeConfig {
	return plugin.HandshakeConfig{
		ProtocolVersion:  version,
		MagicCookieKey:   MagicCookieKey,
		MagicCookieValue: MagicCookieValue,
	}
}

// GRPCPlugin is the go-plugin plugin of the Forms service. The host leaves
// Forms nil; a plugin sets it.
type GRPCPlugin struct {
	plugin.NetRPCUnsupportedPlugin
	Forms pb.FormsServer
}

// GRPCServer registers the Forms service.
func (p *GRPCPlugin) GRPCServer(_ *plugin.GRPCBroker, s *grpc.Server) error {
	if p.Forms == nil {
		return errors.New("pairwell plugin: no Forms server")
	}
	pb.RegisterFormsServer(s, p.Forms)
	return nil
}

// GRPCClient returns a pb.FormsClient.
func (p *GRPCPlugin) GRPCClient(_ context.Context, _ *plugin.GRPCBroker, c *grpc.ClientConn) (any, error) {
	return pb.NewFormsClient(c), nil
}

// dimensions maps units.Dimension to the protocol's enum. The mapping is
// explicit: the enum has an invalid zero value and units.Dimension does not.
var dimensions = [...]struct {
	d units.Dimension
	p pb.Dimension
}{
	{units.Dimensionless, pb.Dimension_DIMENSION_DIMENSIONLESS},
	{units.Energy, pb.Dimension_DIMENSION_ENERGY},
	{units.Length, pb.Dimension_DIMENSION_LENGTH},
	{units.InverseLength, pb.Dimension_DIMENSION_INVERSE_LENGTH},
	{units.ForceConstant, pb.Dimension_DIMENSION_FORCE_CONSTANT},
	{units.Dispersion, pb.Dimension_DIMENSION_DISPERSION},
	{units.Mass, pb.Dimension_DIMENSION_MASS},
	{units.Time, pb.Dimension_DIMENSION_TIME},
	{units.Temperature, pb.Dimension_DIMENSION_TEMPERATURE},
}

// DimensionToProto converts d; ok is false for a dimension the protocol
// does not know.
func DimensionToProto(d units.Dimension) (p pb.Dimension, ok bool) {
	for _, e := range dimensions {
		if e.d == d {
			return e.p, true
		}
	}
	return pb.Dimension_DIMENSION_UNSPECIFIED, false
}

// DimensionFromProto converts p; ok is false for DIMENSION_UNSPECIFIED and
// unknown values.
func DimensionFromProto(p pb.Dimension) (d units.Dimension, ok bool) {
	for _, e := range dimensions {
		if e.p == p {
			return e.d, true
		}
	}
	return 0, false
}

func constraintToProto(c core.Constraint) (pb.Constraint, bool) {
	switch c {
	case core.Finite:
		return pb.Constraint_CONSTRAINT_FINITE, true
	case core.Positive:
		return pb.Constraint_CONSTRAINT_POSITIVE, true
	case core.NonNegative:
		return pb.Constraint_CONSTRAINT_NON_NEGATIVE, true
	}
	return 0, false
}

func constraintFromProto(c pb.Constraint) (core.Constraint, bool) {
	switch c {
	case pb.Constraint_CONSTRAINT_FINITE:
		return core.Finite, true
	case pb.Constraint_CONSTRAINT_POSITIVE:
		return core.Positive, true
	case pb.Constraint_CONSTRAINT_NON_NEGATIVE:
		return core.NonNegative, true
	}
	return 0, false
}

// InfoToProto converts the metadata of a model served by a plugin. Origin
// and Version are the host's business and are not sent.
func InfoToProto(info core.ModelInfo, matcher bool) (*pb.ModelInfo, error) {
	m := &pb.ModelInfo{
		Key: info.Key, Aliases: append([]string(nil), info.Aliases...), Name: info.Name,
		Formula: info.Formula, Domain: info.Domain, Reference: info.Reference,
		Notes: info.Notes, MaxOrder: int32(info.MaxOrder), Matcher: matcher,
	}
	if info.MaxOrder < 0 || info.MaxOrder > math.MaxInt32 {
		return nil, fmt.Errorf("model %q: MaxOrder %d out of range", info.Key, info.MaxOrder)
	}
	for _, p := range info.Params {
		d, ok := DimensionToProto(p.Dimension)
		if !ok {
			return nil, fmt.Errorf("model %q: parameter %q: dimension %v is not in the plugin protocol", info.Key, p.Name, p.Dimension)
		}
		c, ok := constraintToProto(p.Constraint)
		if !ok {
			return nil, fmt.Errorf("model %q: parameter %q: constraint %d is not in the plugin protocol", info.Key, p.Name, int(p.Constraint))
		}
		m.Params = append(m.Params, &pb.Param{
			Name: p.Name, Dimension: d, DimensionName: p.Dimension.String(),
			Constraint: c, Meaning: p.Meaning,
		})
	}
	return m, CheckInfo(m)
}

// InfoFromProto converts and checks the metadata a plugin described.
func InfoFromProto(m *pb.ModelInfo) (core.ModelInfo, error) {
	if err := CheckInfo(m); err != nil {
		return core.ModelInfo{}, err
	}
	info := core.ModelInfo{
		Key: m.GetKey(), Aliases: append([]string(nil), m.GetAliases()...), Name: m.GetName(),
		Formula: m.GetFormula(), Domain: m.GetDomain(), Reference: m.GetReference(),
		Notes: m.GetNotes(), MaxOrder: int(m.GetMaxOrder()),
	}
	for _, p := range m.GetParams() {
		d, ok := DimensionFromProto(p.GetDimension())
		if !ok {
			return core.ModelInfo{}, fmt.Errorf("model %q: parameter %q: unknown dimension %d (%q)", m.GetKey(), p.GetName(), int32(p.GetDimension()), p.GetDimensionName())
		}
		c, ok := constraintFromProto(p.GetConstraint())
		if !ok {
			return core.ModelInfo{}, fmt.Errorf("model %q: parameter %q: unknown constraint %d", m.GetKey(), p.GetName(), int32(p.GetConstraint()))
		}
		info.Params = append(info.Params, core.Param{Name: p.GetName(), Dimension: d, Constraint: c, Meaning: p.GetMeaning()})
	}
	return info, nil
}

// CheckInfo checks what both sides require of a model description: a key,
// a non-negative MaxOrder, named parameters with distinct names and known
// dimensions.
func CheckInfo(m *pb.ModelInfo) error {
	if strings.TrimSpace(m.GetKey()) == "" {
		return errors.New("model with an empty key")
	}
	if strings.ContainsAny(m.GetKey(), ":,= \t") {
		return fmt.Errorf("model %q: a key may not contain ':', ',', '=' or blanks", m.GetKey())
	}
	if m.GetMaxOrder() < 0 {
		return fmt.Errorf("model %q: negative MaxOrder %d", m.GetKey(), m.GetMaxOrder())
	}
	seen := make(map[string]bool)
	for i, p := range m.GetParams() {
		if strings.TrimSpace(p.GetName()) == "" {
			return fmt.Errorf("model %q: parameter %d has no name", m.GetKey(), i)
		}
		if seen[p.GetName()] {
			return fmt.Errorf("model %q: parameter %q listed twice", m.GetKey(), p.GetName())
		}
		seen[p.GetName()] = true
		if _, ok := DimensionFromProto(p.GetDimension()); !ok {
			return fmt.Errorf("model %q: parameter %q: dimension unspecified or unknown (%d)", m.GetKey(), p.GetName(), int32(p.GetDimension()))
		}
	}
	return nil
}

// DomainToProto converts d.
func DomainToProto(d core.Domain) *pb.Domain {
	return &pb.Domain{Min: d.Min, Max: d.Max, Barrier: d.Barrier, Limit: d.Limit,
		BarrierEnergy: d.BarrierEnergy, EquilibriumGuess: d.EquilibriumGuess}
}

// DomainFromProto converts and checks d: Min < Max, neither NaN; a finite
// barrier energy when there is a barrier; a finite, non-negative guess.
func DomainFromProto(d *pb.Domain) (core.Domain, error) {
	if d == nil {
		return core.Domain{}, errors.New("no domain")
	}
	out := core.Domain{Min: d.GetMin(), Max: d.GetMax(), Barrier: d.GetBarrier(), Limit: d.GetLimit(),
		BarrierEnergy: d.GetBarrierEnergy(), EquilibriumGuess: d.GetEquilibriumGuess()}
	if !(out.Min < out.Max) || math.IsNaN(out.Limit) {
		return core.Domain{}, fmt.Errorf("invalid domain (%g Å, %g Å), limit %g eV", out.Min, out.Max, out.Limit)
	}
	if out.Barrier && (math.IsNaN(out.BarrierEnergy) || math.IsInf(out.BarrierEnergy, 0)) {
		return core.Domain{}, fmt.Errorf("the domain has an inner barrier but its energy is %g eV", out.BarrierEnergy)
	}
	if !(out.EquilibriumGuess >= 0) || math.IsInf(out.EquilibriumGuess, 0) {
		return core.Domain{}, fmt.Errorf("invalid equilibrium guess %g Å", out.EquilibriumGuess)
	}
	return out, nil
}

var quantities = [...]struct {
	q conformance.Quantity
	p pb.Quantity
}{
	{conformance.EquilibriumR, pb.Quantity_QUANTITY_EQUILIBRIUM_R},
	{conformance.MinimumEnergy, pb.Quantity_QUANTITY_MINIMUM_ENERGY},
	{conformance.DerivativeAtMinimum, pb.Quantity_QUANTITY_DERIVATIVE_AT_MINIMUM},
	{conformance.ValueAt, pb.Quantity_QUANTITY_VALUE_AT},
}

// IdentityToProto converts id.
func IdentityToProto(id conformance.Identity) (*pb.Identity, error) {
	for _, e := range quantities {
		if e.q == id.Quantity {
			return &pb.Identity{
				Name: id.Name, Quantity: e.p, Order: int32(id.Order), R: id.R,
				Value: id.Value, Source: id.Source,
			}, nil
		}
	}
	return nil, fmt.Errorf("identity %q: quantity %d is not in the plugin protocol", id.Name, int(id.Quantity))
}

// IdentityFromProto converts id.
func IdentityFromProto(id *pb.Identity) (conformance.Identity, error) {
	for _, e := range quantities {
		if e.p == id.GetQuantity() {
			return conformance.Identity{
				Name: id.GetName(), Quantity: e.q, Order: int(id.GetOrder()), R: id.GetR(),
				Value: id.GetValue(), Source: id.GetSource(),
			}, nil
		}
	}
	return conformance.Identity{}, fmt.Errorf("identity %q: unknown quantity %d", id.GetName(), int32(id.GetQuantity()))
}

// kinds pairs each error kind with the core error it stands for.
var kinds = [...]struct {
	k   pb.ErrorKind
	err error
}{
	{pb.ErrorKind_ERROR_KIND_DOMAIN, core.ErrDomain},
	{pb.ErrorKind_ERROR_KIND_ORDER, core.ErrOrder},
	{pb.ErrorKind_ERROR_KIND_PARAM, core.ErrParam},
	{pb.ErrorKind_ERROR_KIND_NO_MINIMUM, core.ErrNoMinimum},
	{pb.ErrorKind_ERROR_KIND_LENGTH, core.ErrLength},
	{pb.ErrorKind_ERROR_KIND_NO_CONVERGENCE, core.ErrNoConvergence},
	{pb.ErrorKind_ERROR_KIND_UNSUPPORTED, core.ErrUnsupported},
}

// FailureFromError classifies err for the wire.
func FailureFromError(err error) *pb.Failure {
	f := &pb.Failure{Kind: pb.ErrorKind_ERROR_KIND_OTHER, Message: err.Error()}
	for _, e := range kinds {
		if errors.Is(err, e.err) {
			f.Kind = e.k
			break
		}
	}
	return f
}

// RemoteError is an error a plugin reported. Its message is the plugin's;
// it unwraps to the core error of its kind (core.ErrDomain, …), so callers
// classify it with errors.Is as they would a built-in's.
type RemoteError struct {
	Kind    pb.ErrorKind
	Message string
}

func (e *RemoteError) Error() string { return e.Message }

// Unwrap returns the core error of the kind, nil for ERROR_KIND_OTHER.
func (e *RemoteError) Unwrap() error {
	for _, k := range kinds {
		if k.k == e.Kind {
			return k.err
		}
	}
	return nil
}

// ErrorFromFailure converts f, which must be non-nil.
func ErrorFromFailure(f *pb.Failure) error {
	msg := f.GetMessage()
	if msg == "" {
		msg = "unspecified error"
	}
	return &RemoteError{Kind: f.GetKind(), Message: msg}
}
