package rules

import "github.com/datumlint/datumlint/grammar/model"

// This file holds the rules about a QIF document as such: what the QIF
// reader (grammar/qif) could not carry into the part model, and where the
// document contradicts itself. The notation's reader records neither kind
// of problem, so the rules are silent on .callouts files.

// qifHeader is the start of the examples: a QIF 3 document in mm under
// ASME Y14.5-2018 with one plane.
const qifHeader = `<QIFDocument xmlns="http://qifstandards.org/xsd/qif3" versionQIF="3.0.0" idMax="5">
  <StandardsDefinitions n="1">
    <Standard id="1">
      <Organization><StandardsOrganizationEnum>ASME</StandardsOrganizationEnum></Organization>
      <Designator>Y14.5</Designator><Year>2018</Year>
    </Standard>
  </StandardsDefinitions>
  <FileUnits>
    <PrimaryUnits>
      <LinearUnit>
        <SIUnitName>meter</SIUnitName><UnitName>mm</UnitName>
        <UnitConversion><Factor>0.001</Factor></UnitConversion>
      </LinearUnit>
    </PrimaryUnits>
  </FileUnits>
  <Features>
    <FeatureDefinitions n="1"><PlaneFeatureDefinition id="2"/></FeatureDefinitions>
    <FeatureNominals n="1">
      <PlaneFeatureNominal id="3">
        <Name>base</Name><FeatureDefinitionId>2</FeatureDefinitionId>
        <Location>0 0 0</Location><Normal>0 0 -1</Normal>
      </PlaneFeatureNominal>
    </FeatureNominals>
  </Features>
  <Characteristics>
    <FormalStandardId>1</FormalStandardId>
`

// qifFlatness ends the examples: a flatness of the plane whose definition
// is given.
func qifFlatness(def string) string {
	return qifHeader + `    <CharacteristicDefinitions n="1">
      <FlatnessCharacteristicDefinition id="4">
` + def + `      </FlatnessCharacteristicDefinition>
    </CharacteristicDefinitions>
    <CharacteristicNominals n="1">
      <FlatnessCharacteristicNominal id="5">
        <CharacteristicDefinitionId>4</CharacteristicDefinitionId>
        <FeatureNominalIds n="1"><Id>3</Id></FeatureNominalIds>
      </FlatnessCharacteristicNominal>
    </CharacteristicNominals>
  </Characteristics>
</QIFDocument>`
}

// QIFUnsupported reports what the QIF reader left out of the part model.
var QIFUnsupported = Register(&Rule{
	ID:       "qif-unsupported",
	Summary:  "something a QIF document says that datumlint's part model cannot carry, and what the reader did with it",
	Severity: Info,
	Rationale: `A QIF document can say more than datumlint checks: feature kinds, modifiers and
requirements the part model has no place for yet. The reader never drops such a thing silently:
it reports it on the element that says it, with what it left out and how it read the rest (a
tolerance per unit area read over the whole feature, a datum on targets read on the targets'
feature). The other findings on the document hold for the model as read, so a finding that
this rule's note explains may need a second look. The QIF ids in the message lead to the
element.`,
	Source: "ANSI/DMSC QIF 3.0-2018 (ISO 23952:2020), Characteristics and Features information models (from memory); common practice: an importer reports what it does not import",
	Bad: qifFlatness(`        <StatisticalCharacteristic>true</StatisticalCharacteristic>
        <ToleranceValue>0.02</ToleranceValue>
`),
	Good: qifFlatness(`        <ToleranceValue>0.02</ToleranceValue>
`),
	Run: func(p *Pass) { reportProblems(p, model.Unsupported) },
})

// QIFInconsistent reports a QIF document that contradicts itself.
var QIFInconsistent = Register(&Rule{
	ID:       "qif-inconsistent",
	Summary:  "a QIF document that contradicts itself or is incomplete: unit labels that disagree, a reference to no element, a size its feature does not have",
	Severity: Warning,
	Rationale: `A QIF document states every value with its unit (the file's units, or a unit
label on the value) and joins its elements by id. Where two statements of one document
disagree, such as a value labelled in a unit the file does not define, geometric tolerances
labelled in one unit while sizes are labelled in another, a presentation that shows another
value than the semantic one, or an id that names no element, at least one of them is wrong, and
a CMM program or a reviewer reading the file would each pick one. The reader reports where
and says which reading it took; it never resolves a contradiction by a silent guess.`,
	Source: "ANSI/DMSC QIF 3.0-2018 (ISO 23952:2020), FileUnits and PrimaryUnits, and ids and references of the QIF library (from memory)",
	Bad: qifFlatness(`        <ToleranceValue linearUnit="inch">0.02</ToleranceValue>
`),
	Good: qifFlatness(`        <ToleranceValue>0.02</ToleranceValue>
`),
	Run: func(p *Pass) { reportProblems(p, model.Inconsistent) },
})

func reportProblems(p *Pass, kind model.ProblemKind) {
	for _, e := range p.Part.Problems {
		if e.Kind == kind {
			p.Report(e.Span, "%s", e.Message)
		}
	}
}
